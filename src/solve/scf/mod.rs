//! Hartree–Fock self-consistent field: restricted closed shell (RHF) and
//! unrestricted (UHF), Roothaan–Hall and Pople–Nesbet equations in a Gaussian basis.
//!
//! Why this shape: the iteration (`iterate`) knows only matrices and a function that
//! turns density matrices into Coulomb and exchange matrices, so the same loop runs
//! with in-core or direct integrals, for a molecule or for a free atom (`atoms`,
//! which gives both the starting density and the deformation reference). Spin
//! bookkeeping lives in `occupation`, the numbers reported with the orbitals in
//! `properties`.
//!
//! References: C. C. J. Roothaan, Rev. Mod. Phys. 23, 69 (1951); J. A. Pople,
//! R. K. Nesbet, J. Chem. Phys. 22, 571 (1954); P. Pulay, J. Comput. Chem. 3, 556
//! (1982) for DIIS; A. Szabo, N. S. Ostlund, Modern Quantum Chemistry (1989), ch. 3.

pub mod atoms;
mod diis;
mod iterate;
pub mod occupation;
pub mod properties;
mod run;

use nalgebra::DMatrix;

pub use iterate::IterationLine;
pub use run::{Stage, solve};

/// Coulomb and exchange matrices for several symmetric density matrices at once:
/// J[D]_μν = Σ (μν|λσ) D_λσ, K[D]_μν = Σ (μλ|νσ) D_λσ.
pub type JkFn<'a> = dyn Fn(&[&DMatrix<f64>]) -> Vec<(DMatrix<f64>, DMatrix<f64>)> + Sync + 'a;

/// Said with every Hartree–Fock result.
pub const CAUTION: &str = "Hartree–Fock neglects electron correlation (bond energies and \
    barriers are poor); orbital energies are Koopmans estimates of ionisation energies";

/// Restricted closed shell or unrestricted.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Reference {
    Restricted,
    Unrestricted,
}

/// How the first density is made.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Guess {
    /// Superposition of spherical free-atom densities in the same basis.
    #[default]
    Atoms,
    /// Orbitals of the core Hamiltonian (no electron repulsion).
    Core,
}

impl std::str::FromStr for Guess {
    type Err = String;
    fn from_str(s: &str) -> std::result::Result<Self, String> {
        match s.trim().to_ascii_lowercase().as_str() {
            "atoms" => Ok(Guess::Atoms),
            "core" => Ok(Guess::Core),
            _ => Err(format!("unknown start {s:?}: use atoms or core")),
        }
    }
}

/// Everything the user may set about an SCF run.
#[derive(Debug, Clone, PartialEq)]
pub struct ScfOptions {
    pub reference: Reference,
    /// 2S + 1; `None` takes 1 for an even electron count and 2 for an odd one.
    pub multiplicity: Option<u32>,
    pub max_iterations: usize,
    /// |ΔE| between iterations, hartree.
    pub energy_tolerance: f64,
    /// RMS of the orbital gradient FDS − SDF in the orthonormal basis.
    pub commutator_tolerance: f64,
    pub guess: Guess,
    /// Memory budget (bytes); stored integrals may take a quarter of it.
    pub memory: u64,
}

impl ScfOptions {
    /// Default convergence: |ΔE| < 1e-10 hartree and RMS commutator < 1e-7.
    pub fn new(reference: Reference) -> Self {
        ScfOptions {
            reference,
            multiplicity: None,
            max_iterations: 128,
            energy_tolerance: 1e-10,
            commutator_tolerance: 1e-7,
            guess: Guess::Atoms,
            memory: crate::budget::DEFAULT_MEMORY,
        }
    }
}

/// The numbers a solved SCF reports beside its orbitals.
#[derive(Debug, Clone, PartialEq)]
pub struct ScfReport {
    pub total_energy: f64,
    pub nuclear_repulsion: f64,
    /// Tr(P h): kinetic plus nuclear attraction.
    pub one_electron: f64,
    /// ½ Tr(P G): Coulomb minus exchange.
    pub two_electron: f64,
    pub iterations: usize,
    /// The last |ΔE| and RMS commutator.
    pub delta_energy: f64,
    pub commutator: f64,
    /// How the two-electron part was done (in-core or direct, with its size).
    pub two_electron_path: String,
    pub guess: Guess,
    /// Whether level shifting had to be switched on.
    pub level_shifted: bool,
    /// Mulliken charge per atom (nuclear charge minus gross population).
    pub mulliken: Vec<f64>,
    pub dipole: properties::Dipole,
    /// ⟨S²⟩ and its exact value S(S+1), for UHF.
    pub s_squared: Option<(f64, f64)>,
    pub alpha_electrons: usize,
    pub beta_electrons: usize,
}
