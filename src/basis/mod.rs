//! Atom-centred basis functions, grouped in shells, and the named sets that place
//! them on a molecule. Nothing here solves anything: a `Basis` is plain data that
//! integrals, solvers and grid evaluation read shell by shell.

pub mod gaussian;
pub mod harmonics;
pub mod named;
pub mod sets;
pub mod slater;
pub mod sto_ng;

pub use gaussian::{Angular, GaussianShell};
pub use sets::BasisSpec;
pub use slater::SlaterShell;

/// A group of functions on one centre that share their radial part. An enum, not a
/// trait object, so the grid hot path dispatches without virtual calls.
#[derive(Debug, Clone, PartialEq)]
pub enum Shell {
    Slater(SlaterShell),
    Gaussian(GaussianShell),
}

impl Shell {
    pub fn atom(&self) -> usize {
        match self {
            Shell::Slater(s) => s.atom,
            Shell::Gaussian(g) => g.atom,
        }
    }

    pub fn center(&self) -> [f64; 3] {
        match self {
            Shell::Slater(s) => s.center,
            Shell::Gaussian(g) => g.center,
        }
    }

    pub fn len(&self) -> usize {
        match self {
            Shell::Slater(s) => s.len(),
            Shell::Gaussian(g) => g.len(),
        }
    }

    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// Short label of function `k` of the shell, e.g. "1s(ζ=1.000)", "2px", "d(xy)".
    pub fn label(&self, k: usize) -> String {
        match self {
            Shell::Slater(s) => {
                let h = harmonics::harmonic_name(s.l, s.ms[k]);
                let h = if s.l == 0 {
                    String::from("s")
                } else {
                    h.to_string()
                };
                format!("{}{}(ζ={:.3})", s.n, h, s.zeta)
            }
            Shell::Gaussian(g) => {
                let ang = match g.functions[k] {
                    Angular::Pure(m) => harmonics::harmonic_name(g.l, m).to_string(),
                    Angular::Cartesian(p) => harmonics::cartesian_name(p),
                };
                let amin = g.exponents.iter().cloned().fold(f64::INFINITY, f64::min);
                match g.exponents.len() {
                    1 => format!("{ang}(α={amin:.4})"),
                    n => format!("{ang}({n}G, α≥{amin:.4})"),
                }
            }
        }
    }

    /// Values of the shell's functions at points (functions × points).
    pub fn values(&self, points: &[[f64; 3]], out: &mut [f64]) {
        match self {
            Shell::Slater(s) => s.values(points, out),
            Shell::Gaussian(g) => g.values(points, out),
        }
    }
}

#[derive(Debug, Clone, PartialEq)]
pub struct Basis {
    /// The set's name as the user gave it, e.g. "sto-3g".
    pub name: String,
    pub shells: Vec<Shell>,
}

/// What kind of set a basis is, read once from its name where it was built; every
/// caution about the basis follows from this one rule.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum BasisKind {
    /// One 1s Slater function per atom.
    Slater1s,
    /// A named STO-nG set (sto-3g, sto-6g).
    StoNg,
    /// The valence Slater set of extended Hückel.
    Valence,
    /// Even-tempered or the user's own shells.
    Extended,
    /// Functions read from an orbital file.
    FromFile,
}

impl BasisKind {
    /// One function per occupied atomic shell: energies are upper bounds far from
    /// the basis limit, and bonds come out too weak.
    pub fn is_minimal(self) -> bool {
        matches!(
            self,
            BasisKind::Slater1s | BasisKind::StoNg | BasisKind::Valence
        )
    }
}

impl Basis {
    /// The kind of set, from the name its builder gave it.
    pub fn kind(&self) -> BasisKind {
        match self.name.as_str() {
            "slater-1s" => BasisKind::Slater1s,
            n if n.starts_with("sto-") => BasisKind::StoNg,
            "extended-huckel valence" => BasisKind::Valence,
            "orbital file" => BasisKind::FromFile,
            _ => BasisKind::Extended,
        }
    }

    /// Number of basis functions.
    pub fn len(&self) -> usize {
        self.shells.iter().map(Shell::len).sum()
    }

    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// Index of the first function of each shell.
    pub fn offsets(&self) -> Vec<usize> {
        let mut at = 0;
        self.shells
            .iter()
            .map(|s| {
                let o = at;
                at += s.len();
                o
            })
            .collect()
    }

    /// (atom, label) of every function, in basis order.
    pub fn function_labels(&self) -> Vec<(usize, String)> {
        self.shells
            .iter()
            .flat_map(|s| (0..s.len()).map(move |k| (s.atom(), s.label(k))))
            .collect()
    }

    /// Whether every shell is Gaussian (analytic integrals exist for any geometry).
    pub fn all_gaussian(&self) -> bool {
        self.shells.iter().all(|s| matches!(s, Shell::Gaussian(_)))
    }
}
