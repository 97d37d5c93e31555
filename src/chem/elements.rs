//! The element table: atomic number, symbol, name and single-bond covalent radius,
//! for Z = 1–118 and Z = 0, a dummy or ghost centre (symbol `X`).
//!
//! Covalent radii (Å) for Z = 1–96 are those of B. Cordero et al., "Covalent radii
//! revisited", Dalton Trans. 2008, 2832–2838, Table 2 (carbon: the sp³ value;
//! manganese, iron and cobalt: the low-spin values); typed from memory, with H, C, N,
//! O and Fe checked against values we are sure of in the tests. The paper stops at
//! curium, so Z = 97–118 take a fallback of 1.50 Å (common practice), and a ghost
//! centre takes hydrogen's 0.31 Å so that it is marked like the smallest atom.
//! Radii choose figure and box extents only, never a result.
//!
//! The table says what an element *is*; what a method can treat is the method's
//! business (basis sets and extended-Hückel parameters keep their own coverage and
//! say so in their errors). Everything that only reads atoms — XYZ, model, orbital and
//! cube files — accepts every element here.

#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Element {
    pub symbol: &'static str,
    /// English name (IUPAC spelling: aluminium, caesium, sulfur).
    pub name: &'static str,
    /// 0 for a dummy or ghost centre: no nucleus, no electrons.
    pub atomic_number: u32,
    /// Single-bond covalent radius in ångström.
    pub covalent_radius_angstrom: f64,
}

/// Covalent radius (Å) used beyond the last element of Cordero et al. (Cm, Z = 96):
/// common practice.
pub const FALLBACK_RADIUS: f64 = 1.50;
/// Nominal radius (Å) of a ghost centre, hydrogen's: common practice.
pub const GHOST_RADIUS: f64 = 0.31;
/// The largest atomic number known (oganesson).
pub const MAX_Z: u32 = 118;

const fn el(atomic_number: u32, symbol: &'static str, name: &'static str, r: f64) -> Element {
    Element {
        symbol,
        name,
        atomic_number,
        covalent_radius_angstrom: r,
    }
}

/// Z = 0 (ghost) to Z = 118, indexed by atomic number.
pub const ELEMENTS: [Element; 119] = [
    el(0, "X", "dummy centre", GHOST_RADIUS),
    el(1, "H", "hydrogen", 0.31),
    el(2, "He", "helium", 0.28),
    el(3, "Li", "lithium", 1.28),
    el(4, "Be", "beryllium", 0.96),
    el(5, "B", "boron", 0.84),
    el(6, "C", "carbon", 0.76),
    el(7, "N", "nitrogen", 0.71),
    el(8, "O", "oxygen", 0.66),
    el(9, "F", "fluorine", 0.57),
    el(10, "Ne", "neon", 0.58),
    el(11, "Na", "sodium", 1.66),
    el(12, "Mg", "magnesium", 1.41),
    el(13, "Al", "aluminium", 1.21),
    el(14, "Si", "silicon", 1.11),
    el(15, "P", "phosphorus", 1.07),
    el(16, "S", "sulfur", 1.05),
    el(17, "Cl", "chlorine", 1.02),
    el(18, "Ar", "argon", 1.06),
    el(19, "K", "potassium", 2.03),
    el(20, "Ca", "calcium", 1.76),
    el(21, "Sc", "scandium", 1.70),
    el(22, "Ti", "titanium", 1.60),
    el(23, "V", "vanadium", 1.53),
    el(24, "Cr", "chromium", 1.39),
    el(25, "Mn", "manganese", 1.39),
    el(26, "Fe", "iron", 1.32),
    el(27, "Co", "cobalt", 1.26),
    el(28, "Ni", "nickel", 1.24),
    el(29, "Cu", "copper", 1.32),
    el(30, "Zn", "zinc", 1.22),
    el(31, "Ga", "gallium", 1.22),
    el(32, "Ge", "germanium", 1.20),
    el(33, "As", "arsenic", 1.19),
    el(34, "Se", "selenium", 1.20),
    el(35, "Br", "bromine", 1.20),
    el(36, "Kr", "krypton", 1.16),
    el(37, "Rb", "rubidium", 2.20),
    el(38, "Sr", "strontium", 1.95),
    el(39, "Y", "yttrium", 1.90),
    el(40, "Zr", "zirconium", 1.75),
    el(41, "Nb", "niobium", 1.64),
    el(42, "Mo", "molybdenum", 1.54),
    el(43, "Tc", "technetium", 1.47),
    el(44, "Ru", "ruthenium", 1.46),
    el(45, "Rh", "rhodium", 1.42),
    el(46, "Pd", "palladium", 1.39),
    el(47, "Ag", "silver", 1.45),
    el(48, "Cd", "cadmium", 1.44),
    el(49, "In", "indium", 1.42),
    el(50, "Sn", "tin", 1.39),
    el(51, "Sb", "antimony", 1.39),
    el(52, "Te", "tellurium", 1.38),
    el(53, "I", "iodine", 1.39),
    el(54, "Xe", "xenon", 1.40),
    el(55, "Cs", "caesium", 2.44),
    el(56, "Ba", "barium", 2.15),
    el(57, "La", "lanthanum", 2.07),
    el(58, "Ce", "cerium", 2.04),
    el(59, "Pr", "praseodymium", 2.03),
    el(60, "Nd", "neodymium", 2.01),
    el(61, "Pm", "promethium", 1.99),
    el(62, "Sm", "samarium", 1.98),
    el(63, "Eu", "europium", 1.98),
    el(64, "Gd", "gadolinium", 1.96),
    el(65, "Tb", "terbium", 1.94),
    el(66, "Dy", "dysprosium", 1.92),
    el(67, "Ho", "holmium", 1.92),
    el(68, "Er", "erbium", 1.89),
    el(69, "Tm", "thulium", 1.90),
    el(70, "Yb", "ytterbium", 1.87),
    el(71, "Lu", "lutetium", 1.87),
    el(72, "Hf", "hafnium", 1.75),
    el(73, "Ta", "tantalum", 1.70),
    el(74, "W", "tungsten", 1.62),
    el(75, "Re", "rhenium", 1.51),
    el(76, "Os", "osmium", 1.44),
    el(77, "Ir", "iridium", 1.41),
    el(78, "Pt", "platinum", 1.36),
    el(79, "Au", "gold", 1.36),
    el(80, "Hg", "mercury", 1.32),
    el(81, "Tl", "thallium", 1.45),
    el(82, "Pb", "lead", 1.46),
    el(83, "Bi", "bismuth", 1.48),
    el(84, "Po", "polonium", 1.40),
    el(85, "At", "astatine", 1.50),
    el(86, "Rn", "radon", 1.50),
    el(87, "Fr", "francium", 2.60),
    el(88, "Ra", "radium", 2.21),
    el(89, "Ac", "actinium", 2.15),
    el(90, "Th", "thorium", 2.06),
    el(91, "Pa", "protactinium", 2.00),
    el(92, "U", "uranium", 1.96),
    el(93, "Np", "neptunium", 1.90),
    el(94, "Pu", "plutonium", 1.87),
    el(95, "Am", "americium", 1.80),
    el(96, "Cm", "curium", 1.69),
    el(97, "Bk", "berkelium", FALLBACK_RADIUS),
    el(98, "Cf", "californium", FALLBACK_RADIUS),
    el(99, "Es", "einsteinium", FALLBACK_RADIUS),
    el(100, "Fm", "fermium", FALLBACK_RADIUS),
    el(101, "Md", "mendelevium", FALLBACK_RADIUS),
    el(102, "No", "nobelium", FALLBACK_RADIUS),
    el(103, "Lr", "lawrencium", FALLBACK_RADIUS),
    el(104, "Rf", "rutherfordium", FALLBACK_RADIUS),
    el(105, "Db", "dubnium", FALLBACK_RADIUS),
    el(106, "Sg", "seaborgium", FALLBACK_RADIUS),
    el(107, "Bh", "bohrium", FALLBACK_RADIUS),
    el(108, "Hs", "hassium", FALLBACK_RADIUS),
    el(109, "Mt", "meitnerium", FALLBACK_RADIUS),
    el(110, "Ds", "darmstadtium", FALLBACK_RADIUS),
    el(111, "Rg", "roentgenium", FALLBACK_RADIUS),
    el(112, "Cn", "copernicium", FALLBACK_RADIUS),
    el(113, "Nh", "nihonium", FALLBACK_RADIUS),
    el(114, "Fl", "flerovium", FALLBACK_RADIUS),
    el(115, "Mc", "moscovium", FALLBACK_RADIUS),
    el(116, "Lv", "livermorium", FALLBACK_RADIUS),
    el(117, "Ts", "tennessine", FALLBACK_RADIUS),
    el(118, "Og", "oganesson", FALLBACK_RADIUS),
];

/// What the table covers, for messages.
pub const COVERAGE: &str = "H–Og (Z = 1–118) and X (Z = 0, a dummy or ghost centre)";

/// Looks an element up by symbol, ignoring case ("cl", "CL" and "Cl" all work; no two
/// symbols differ only in case).
pub fn by_symbol(symbol: &str) -> Option<&'static Element> {
    let s = symbol.trim();
    ELEMENTS.iter().find(|e| e.symbol.eq_ignore_ascii_case(s))
}

/// Looks an element up by atomic number (0 is the ghost centre).
pub fn by_number(z: u32) -> Option<&'static Element> {
    ELEMENTS.get(usize::try_from(z).ok()?)
}

/// The error text for a symbol that names no element.
pub fn unknown_symbol(symbol: &str) -> String {
    format!("unknown element {symbol:?} (known: {COVERAGE})")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn table_is_in_order_and_lookups_agree() {
        for (i, e) in ELEMENTS.iter().enumerate() {
            assert_eq!(e.atomic_number as usize, i);
            assert_eq!(by_symbol(&e.symbol.to_uppercase()), Some(e));
            assert_eq!(by_symbol(&e.symbol.to_lowercase()), Some(e));
            assert_eq!(by_number(e.atomic_number), Some(e));
            assert!(e.covalent_radius_angstrom > 0.2 && e.covalent_radius_angstrom < 2.7);
        }
        assert!(by_symbol("Xx").is_none());
        assert!(by_number(MAX_Z + 1).is_none());
        assert_eq!(by_number(0).unwrap().symbol, "X");
        // Symbols are unique even ignoring case (by_symbol relies on it).
        for (i, a) in ELEMENTS.iter().enumerate() {
            for b in &ELEMENTS[i + 1..] {
                assert!(!a.symbol.eq_ignore_ascii_case(b.symbol), "{}", a.symbol);
            }
        }
    }

    /// Symbols and atomic numbers of the periodic table (IUPAC), from memory: a few
    /// landmarks across the table, including the four names of 2016.
    #[test]
    fn symbols_match_the_periodic_table() {
        for (z, s, name) in [
            (1, "H", "hydrogen"),
            (18, "Ar", "argon"),
            (22, "Ti", "titanium"),
            (26, "Fe", "iron"),
            (36, "Kr", "krypton"),
            (54, "Xe", "xenon"),
            (74, "W", "tungsten"),
            (79, "Au", "gold"),
            (86, "Rn", "radon"),
            (92, "U", "uranium"),
            (96, "Cm", "curium"),
            (113, "Nh", "nihonium"),
            (115, "Mc", "moscovium"),
            (117, "Ts", "tennessine"),
            (118, "Og", "oganesson"),
        ] {
            let e = by_number(z).unwrap();
            assert_eq!((e.symbol, e.name), (s, name), "Z = {z}");
        }
    }

    /// Cordero et al., Dalton Trans. 2008, 2832, Table 2 (from memory): H 0.31,
    /// C(sp³) 0.76, N 0.71, O 0.66, Fe (low spin) 1.32, Cs 2.44 (the largest below
    /// Fr), Cm 1.69; beyond curium the documented fallback.
    #[test]
    fn radii_from_cordero() {
        for (s, r) in [
            ("H", 0.31),
            ("C", 0.76),
            ("N", 0.71),
            ("O", 0.66),
            ("Fe", 1.32),
            ("Cs", 2.44),
            ("Cm", 1.69),
            ("Og", FALLBACK_RADIUS),
        ] {
            assert_eq!(by_symbol(s).unwrap().covalent_radius_angstrom, r, "{s}");
        }
    }
}
