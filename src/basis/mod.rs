//! Atom-centred basis functions and the named sets that place them on a molecule.
//! Nothing here solves anything: a `Basis` is plain data that integrals, solvers and
//! grid evaluation read.

pub mod named;
pub mod slater;
pub mod sto_ng;

use std::collections::BTreeMap;

pub use slater::Slater1s;

use crate::chem::Molecule;
use crate::error::{Error, Result};

/// One basis function. An enum (not a trait object) so that the grid hot path can
/// dispatch without virtual calls and the orbital file can name each kind.
#[derive(Debug, Clone, PartialEq)]
pub enum BasisFunction {
    Slater1s(Slater1s),
}

impl BasisFunction {
    pub fn atom(&self) -> usize {
        match self {
            BasisFunction::Slater1s(f) => f.atom,
        }
    }

    /// Short label such as "1s(ζ=1.000)" for tables.
    pub fn label(&self) -> String {
        match self {
            BasisFunction::Slater1s(f) => format!("1s(ζ={:.3})", f.zeta),
        }
    }

    pub fn value(&self, p: [f64; 3]) -> f64 {
        match self {
            BasisFunction::Slater1s(f) => f.value(p),
        }
    }

    pub fn values(&self, points: &[[f64; 3]], out: &mut [f64]) {
        match self {
            BasisFunction::Slater1s(f) => f.values(points, out),
        }
    }
}

/// The named basis sets lobecast knows.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum BasisSetName {
    /// One 1s Slater function per atom; ζ per element, default ζ = Z.
    Slater1s,
}

impl BasisSetName {
    pub fn parse(name: &str) -> Result<Self> {
        match name.to_ascii_lowercase().as_str() {
            "slater-1s" => Ok(BasisSetName::Slater1s),
            other => Err(Error::input(format!("unknown basis set {other:?}"))
                .with_hint("the basis sets available are: slater-1s")),
        }
    }

    pub fn as_str(self) -> &'static str {
        match self {
            BasisSetName::Slater1s => "slater-1s",
        }
    }
}

#[derive(Debug, Clone, PartialEq)]
pub struct Basis {
    pub name: BasisSetName,
    pub functions: Vec<BasisFunction>,
}

impl Basis {
    /// Places the named set on every atom. `zeta` overrides the exponent per element
    /// symbol (exact case as in the element table).
    pub fn build(
        name: BasisSetName,
        molecule: &Molecule,
        zeta: &BTreeMap<String, f64>,
    ) -> Result<Self> {
        for (symbol, z) in zeta {
            if crate::chem::elements::by_symbol(symbol).is_none() {
                return Err(Error::input(format!(
                    "[basis] zeta names an unknown element {symbol:?}"
                )));
            }
            if !(z.is_finite() && *z > 0.0) {
                return Err(Error::input(format!(
                    "[basis] zeta for {symbol} must be a positive number, got {z}"
                )));
            }
        }
        let functions = match name {
            BasisSetName::Slater1s => molecule
                .atoms
                .iter()
                .enumerate()
                .map(|(i, a)| {
                    let z = zeta
                        .iter()
                        .find(|(s, _)| s.eq_ignore_ascii_case(a.element.symbol))
                        .map(|(_, z)| *z)
                        .unwrap_or(a.charge());
                    BasisFunction::Slater1s(Slater1s {
                        atom: i,
                        center: a.position,
                        zeta: z,
                    })
                })
                .collect(),
        };
        Ok(Basis { name, functions })
    }

    pub fn len(&self) -> usize {
        self.functions.len()
    }

    pub fn is_empty(&self) -> bool {
        self.functions.is_empty()
    }
}
