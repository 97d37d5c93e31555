//! Chemistry that knows nothing of basis sets: elements, atoms, molecules, XYZ files
//! and length units.

pub mod colours;
pub mod elements;
pub mod molecule;
pub mod units;

pub use elements::Element;
pub use molecule::{Atom, Molecule};
pub use units::LengthUnit;
