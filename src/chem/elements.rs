//! The element table: symbol, atomic number and single-bond covalent radius.
//!
//! Covalent radii (Å) are those of B. Cordero et al., "Covalent radii revisited",
//! Dalton Trans. 2008, 2832–2838, Table 2 (carbon: the sp³ value); from memory.
//! They are used only to choose sensible figure and box extents, never in a result.

#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Element {
    pub symbol: &'static str,
    pub atomic_number: u32,
    /// Single-bond covalent radius in ångström.
    pub covalent_radius_angstrom: f64,
}

const fn el(symbol: &'static str, atomic_number: u32, r: f64) -> Element {
    Element {
        symbol,
        atomic_number,
        covalent_radius_angstrom: r,
    }
}

/// Hydrogen to argon, in order of atomic number.
pub const ELEMENTS: [Element; 18] = [
    el("H", 1, 0.31),
    el("He", 2, 0.28),
    el("Li", 3, 1.28),
    el("Be", 4, 0.96),
    el("B", 5, 0.84),
    el("C", 6, 0.76),
    el("N", 7, 0.71),
    el("O", 8, 0.66),
    el("F", 9, 0.57),
    el("Ne", 10, 0.58),
    el("Na", 11, 1.66),
    el("Mg", 12, 1.41),
    el("Al", 13, 1.21),
    el("Si", 14, 1.11),
    el("P", 15, 1.07),
    el("S", 16, 1.05),
    el("Cl", 17, 1.02),
    el("Ar", 18, 1.06),
];

/// Looks an element up by symbol, ignoring case ("cl", "CL" and "Cl" all work).
pub fn by_symbol(symbol: &str) -> Option<&'static Element> {
    ELEMENTS
        .iter()
        .find(|e| e.symbol.eq_ignore_ascii_case(symbol.trim()))
}

pub fn by_number(z: u32) -> Option<&'static Element> {
    ELEMENTS.get((z as usize).checked_sub(1)?)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn table_is_in_order_and_lookups_agree() {
        for (i, e) in ELEMENTS.iter().enumerate() {
            assert_eq!(e.atomic_number as usize, i + 1);
            assert_eq!(by_symbol(&e.symbol.to_uppercase()), Some(e));
            assert_eq!(by_number(e.atomic_number), Some(e));
        }
        assert!(by_symbol("Xx").is_none());
        assert!(by_number(0).is_none());
    }
}
