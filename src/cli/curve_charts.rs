//! The data behind `curve --png`: what the chart module draws, from either path.

use lobecast::io::model::Model;
use lobecast::plot::curve::CurveData;
use lobecast::solve::curve::{CurvePoint, Equilibrium, StatesPoint, ZetaChoice, separated_limit};

const UNITS_NOTE: &str = "Total energies at fixed nuclei (nuclear repulsion included); 1 hartree = 27.211386 eV, 1 bohr = 0.529177 Å.";
const MINIMAL_NOTE: &str = "Minimal basis: energies are variational upper bounds and the bond is too weak; use them for trends.";

/// The closed-form two-centre model: both energies and S, J, K.
pub fn two_centre(
    model: &Model,
    points: &[CurvePoint],
    eq: Option<Equilibrium>,
    choice: ZetaChoice,
) -> CurveData {
    let col = |f: fn(&CurvePoint) -> f64| points.iter().map(f).collect::<Vec<f64>>();
    let formula = lobecast::render::text::formula_markup(&model.molecule.formula_with_charge());
    let zeta = match choice {
        ZetaChoice::Fixed(z) => format!("{z}"),
        ZetaChoice::Optimized => "optimised at each R".into(),
    };
    let z = model.molecule.atoms[0].charge();
    CurveData {
        title: format!("{formula}, one 1s Slater function per nucleus, ζ = {zeta}"),
        r: col(|p| p.r),
        overlap: col(|p| p.model.s),
        coulomb: col(|p| p.model.coulomb),
        exchange: col(|p| p.model.exchange),
        e_bonding: col(|p| p.model.e_bonding),
        e_antibonding: col(|p| p.model.e_antibonding),
        state_labels: ["E_{+} (bonding)".into(), "E_{−} (antibonding)".into()],
        equilibrium: eq.map(|e| (e.r, e.energy)),
        limit: separated_limit(z),
        footnotes: vec![UNITS_NOTE.into(), MINIMAL_NOTE.into()],
        width: 1000,
    }
}

/// Any other basis: the two lowest states (no S, J, K). `None` with fewer than two.
pub fn states(model: &Model, points: &[StatesPoint], eq: Option<(f64, f64)>) -> Option<CurveData> {
    if points.first().is_none_or(|p| p.energies.len() < 2) {
        return None;
    }
    let formula = lobecast::render::text::formula_markup(&model.molecule.formula_with_charge());
    let zmax = model
        .molecule
        .atoms
        .iter()
        .map(|a| a.charge())
        .fold(0.0, f64::max);
    let basis = model.basis().map_or("", |b| b.name.as_str());
    let minimal = model.basis().is_some_and(|b| b.kind().is_minimal());
    let mut footnotes = vec![UNITS_NOTE.to_string()];
    if minimal {
        footnotes.push(MINIMAL_NOTE.into());
    }
    Some(CurveData {
        title: format!("{formula}, basis {basis}: the two lowest states"),
        r: points.iter().map(|p| p.r).collect(),
        overlap: Vec::new(),
        coulomb: Vec::new(),
        exchange: Vec::new(),
        e_bonding: points.iter().map(|p| p.energies[0]).collect(),
        e_antibonding: points.iter().map(|p| p.energies[1]).collect(),
        state_labels: ["E_{1} (lowest)".into(), "E_{2}".into()],
        equilibrium: eq,
        limit: separated_limit(zmax),
        footnotes,
        width: 1000,
    })
}

/// The build-up chart: electrons gained or lost between the nuclei against R.
pub fn buildup(
    model: &Model,
    rs: &[f64],
    b: &[lobecast::field::buildup::Buildup],
) -> lobecast::Result<lobecast::render::canvas::Canvas> {
    use lobecast::plot::profile::{Profile, Series, draw};
    let bonding: Vec<f64> = b.iter().map(|x| x.between[0]).collect();
    let antibonding: Vec<f64> = b.iter().map(|x| x.between[1]).collect();
    let formula = lobecast::render::text::formula_markup(&model.molecule.formula_with_charge());
    draw(&Profile {
        title: format!("{formula}: electrons gained between the nuclei"),
        s: rs,
        series: vec![
            Series { label: "bonding orbital (1)".into(), values: &bonding },
            Series { label: "antibonding orbital (2)".into(), values: &antibonding },
        ],
        y_label: "electrons gained between the nuclei, ∫Δρ / e".into(),
        x_label: "R / bohr".into(),
        nuclei: Vec::new(),
        footnotes: vec![
            "Δρ = |ψ|^{2} − Σ_{μ} q_{μ} φ_{μ}^{2}: the orbital's density minus its own atomic pieces (Mulliken gross populations q_{μ}); it integrates to zero over all space.".into(),
            "The slab lies between the two planes through the nuclei perpendicular to the bond.".into(),
        ],
        width: 1000,
        background: lobecast::render::canvas::Colour::WHITE,
    })
}
