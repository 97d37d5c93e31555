//! The printed table, CSV and JSON of `lobecast curve`.

use serde::Serialize;

use lobecast::chem::units::{bohr_to_angstrom, hartree_to_ev};
use lobecast::field::buildup::Buildup;
use lobecast::io::model::Model;
use lobecast::solve::curve::{CurvePoint, Equilibrium, StatesPoint, ZetaChoice, separated_limit};
use lobecast::solve::one_electron::MINIMAL_BASIS_CAVEAT;

/// Everything `curve` prints and writes.
pub struct Document {
    pub table: String,
    pub equilibrium_line: String,
    pub csv: String,
    pub json: String,
    pub minimal_basis: bool,
}

#[derive(Serialize)]
struct Json<P: Serialize> {
    format: &'static str,
    version: u32,
    model: String,
    basis: String,
    length_unit: &'static str,
    energy_unit: &'static str,
    separated_limit_hartree: f64,
    equilibrium: Option<EquilibriumJson>,
    points: Vec<P>,
    notes: Vec<String>,
}

#[derive(Serialize)]
struct EquilibriumJson {
    r_bohr: f64,
    r_angstrom: f64,
    energy_hartree: f64,
    binding_energy_hartree: f64,
    binding_energy_ev: f64,
    #[serde(skip_serializing_if = "Option::is_none")]
    zeta: Option<f64>,
}

impl EquilibriumJson {
    fn new(r: f64, energy: f64, limit: f64, zeta: Option<f64>) -> Self {
        EquilibriumJson {
            r_bohr: r,
            r_angstrom: bohr_to_angstrom(r),
            energy_hartree: energy,
            binding_energy_hartree: limit - energy,
            binding_energy_ev: hartree_to_ev(limit - energy),
            zeta,
        }
    }
}

/// The JSON text, keys in alphabetical order at every level (through serde_json's
/// sorted map), so a document reads the same with and without the build-up keys.
fn json_text<P: Serialize>(doc: &Json<P>) -> String {
    let value = serde_json::to_value(doc).expect("curve documents serialise");
    serde_json::to_string_pretty(&value).expect("JSON values serialise") + "\n"
}

/// The build-up numbers of one separation, as the JSON points carry them.
#[derive(Serialize)]
struct BuildupJson {
    between_bonding: f64,
    between_antibonding: f64,
    midpoint_bonding: f64,
    midpoint_antibonding: f64,
}

impl From<&Buildup> for BuildupJson {
    fn from(x: &Buildup) -> Self {
        BuildupJson {
            between_bonding: x.between[0],
            between_antibonding: x.between[1],
            midpoint_bonding: x.midpoint[0],
            midpoint_antibonding: x.midpoint[1],
        }
    }
}

/// The build-up columns of the table and the CSV: header, explanation, one row.
const BUILDUP_CSV_HEADER: &str =
    ",between_bonding,between_antibonding,midpoint_bonding,midpoint_antibonding";
const BUILDUP_CSV_NOTE: &str = "# between_*: electrons gained (>0) or lost (<0) between the planes through the nuclei perpendicular to the bond, i.e. the slab integral of the orbital deformation density of orbital 1 (bonding) or 2 (antibonding); midpoint_*: that density at the bond midpoint, e/bohr^3\n";

fn buildup_table_header() -> String {
    format!(
        " {:>11} {:>11} {:>11} {:>11}",
        "gain+/e", "gain-/e", "mid+/bohr-3", "mid-/bohr-3"
    )
}

fn buildup_table_cells(x: &Buildup) -> String {
    format!(
        " {:11.6} {:11.6} {:11.6} {:11.6}",
        x.between[0], x.between[1], x.midpoint[0], x.midpoint[1]
    )
}

fn buildup_csv_cells(x: &Buildup) -> String {
    format!(
        ",{:.10e},{:.10e},{:.10e},{:.10e}",
        x.between[0], x.between[1], x.midpoint[0], x.midpoint[1]
    )
}

fn equilibrium_line(eq: Option<(f64, f64, Option<f64>)>, limit: f64) -> String {
    let Some((r, e, zeta)) = eq else {
        return "no minimum inside the scan: the lowest energy is at an end; widen --from/--to"
            .into();
    };
    let de = limit - e;
    format!(
        "equilibrium of the lowest state: R_e = {r:.5} bohr ({:.5} Å), E = {e:.8} hartree{}; \
         binding energy D_e = {de:.6} hartree = {:.4} eV (from the separated limit {limit:.4} hartree)",
        bohr_to_angstrom(r),
        zeta.map_or(String::new(), |z| format!(" at ζ = {z:.6}")),
        hartree_to_ev(de),
    )
}

/// The closed-form two-centre 1s model.
pub struct TwoCentre<'a> {
    pub model: &'a Model,
    pub z: f64,
    pub choice: ZetaChoice,
    pub points: Vec<CurvePoint>,
    pub eq: Option<Equilibrium>,
    /// Build-up numbers, one per point, when asked for.
    pub buildup: Option<&'a [Buildup]>,
}

#[derive(Serialize)]
struct TwoCentrePoint {
    r_bohr: f64,
    r_angstrom: f64,
    overlap: f64,
    coulomb: f64,
    exchange: f64,
    e_bonding: f64,
    e_antibonding: f64,
    zeta: f64,
    #[serde(flatten)]
    buildup: Option<BuildupJson>,
}

impl TwoCentre<'_> {
    pub fn into_document(self) -> Document {
        let opt = self.choice == ZetaChoice::Optimized;
        let zeta_text = match self.choice {
            ZetaChoice::Fixed(z) => format!("{z}"),
            ZetaChoice::Optimized => "optimised at each R".into(),
        };
        let limit = separated_limit(self.z);
        let mut table = format!(
            "lobecast curve: {}, one electron, Z = {}, one 1s Slater function per nucleus, ζ = {zeta_text}; {} separations\n",
            self.model.molecule.formula_with_charge(),
            self.z,
            self.points.len()
        );
        let b = self.buildup;
        table += &format!(
            "{:>9} {:>9} {:>10} {:>12} {:>12} {:>13} {:>13}{}{}\n",
            "R/bohr",
            "R/Å",
            "S",
            "J/hartree",
            "K/hartree",
            "E+/hartree",
            "E-/hartree",
            if opt {
                format!(" {:>8}", "ζ")
            } else {
                String::new()
            },
            b.map_or(String::new(), |_| buildup_table_header())
        );
        let mut csv = format!(
            "# lobecast {} energy curve: two identical nuclei of charge Z = {}, one electron, one normalised 1s Slater function per nucleus, zeta = {zeta_text}\n\
             # units: r_bohr in bohr, r_angstrom in angstrom, overlap dimensionless, all energies in hartree\n\
             # overlap S = <phiA|phiB>; E_atom = zeta^2/2 - Z*zeta (one 1s function on its own nucleus)\n\
             # coulomb J = H_AA - E_atom; exchange K = H_AB - E_atom*S; H includes the nuclear repulsion Z^2/R\n\
             # e_bonding = E_atom + (J+K)/(1+S); e_antibonding = E_atom + (J-K)/(1-S); for zeta = Z: J = Z^2/R + <phiA|-Z/rB|phiA>, K = S*Z^2/R + <phiB|-Z/rB|phiA>\n\
             # caution: {MINIMAL_BASIS_CAVEAT}\n\
             {}r_bohr,r_angstrom,overlap,coulomb,exchange,e_bonding,e_antibonding{}{}\n",
            env!("CARGO_PKG_VERSION"),
            self.z,
            b.map_or("", |_| BUILDUP_CSV_NOTE),
            if opt { ",zeta" } else { "" },
            b.map_or("", |_| BUILDUP_CSV_HEADER)
        );
        for (i, p) in self.points.iter().enumerate() {
            let m = &p.model;
            let zcol = |w: String| if opt { w } else { String::new() };
            table += &format!(
                "{:9.4} {:9.4} {:10.6} {:12.7} {:12.7} {:13.8} {:13.8}{}{}\n",
                p.r,
                bohr_to_angstrom(p.r),
                m.s,
                m.coulomb,
                m.exchange,
                m.e_bonding,
                m.e_antibonding,
                zcol(format!(" {:8.5}", p.zeta)),
                b.map_or(String::new(), |b| buildup_table_cells(&b[i]))
            );
            csv += &format!(
                "{},{},{:.12e},{:.12e},{:.12e},{:.12e},{:.12e}{}{}\n",
                p.r,
                bohr_to_angstrom(p.r),
                m.s,
                m.coulomb,
                m.exchange,
                m.e_bonding,
                m.e_antibonding,
                zcol(format!(",{:.10}", p.zeta)),
                b.map_or(String::new(), |b| buildup_csv_cells(&b[i]))
            );
        }
        let json = json_text(&Json {
            format: "lobecast-curve",
            version: 1,
            model: self.model.path.display().to_string(),
            basis: format!("slater-1s, zeta {zeta_text}"),
            length_unit: "bohr",
            energy_unit: "hartree",
            separated_limit_hartree: limit,
            equilibrium: self
                .eq
                .map(|e| EquilibriumJson::new(e.r, e.energy, limit, Some(e.zeta))),
            points: self
                .points
                .iter()
                .enumerate()
                .map(|(i, p)| TwoCentrePoint {
                    r_bohr: p.r,
                    r_angstrom: bohr_to_angstrom(p.r),
                    overlap: p.model.s,
                    coulomb: p.model.coulomb,
                    exchange: p.model.exchange,
                    e_bonding: p.model.e_bonding,
                    e_antibonding: p.model.e_antibonding,
                    zeta: p.zeta,
                    buildup: b.map(|b| BuildupJson::from(&b[i])),
                })
                .collect(),
            notes: vec![MINIMAL_BASIS_CAVEAT.to_string()],
        });
        let eq = self.eq.map(|e| (e.r, e.energy, opt.then_some(e.zeta)));
        Document {
            table,
            equilibrium_line: equilibrium_line(eq, limit),
            csv,
            json,
            minimal_basis: true,
        }
    }
}

/// Any basis: the lowest states, solved at each separation.
pub struct States<'a> {
    pub model: &'a Model,
    pub points: Vec<StatesPoint>,
    pub eq: Option<(f64, f64)>,
    /// Build-up numbers, one per point, when asked for.
    pub buildup: Option<&'a [Buildup]>,
}

#[derive(Serialize)]
struct StatesJsonPoint {
    r_bohr: f64,
    r_angstrom: f64,
    energies_hartree: Vec<f64>,
    #[serde(flatten)]
    buildup: Option<BuildupJson>,
}

impl States<'_> {
    pub fn into_document(self) -> Document {
        let m = &self.model.molecule;
        let zmax = m.atoms.iter().map(|a| a.charge()).fold(0.0, f64::max);
        // The electron ends on the nucleus that binds it more: −Z_max²/2.
        let limit = separated_limit(zmax);
        let k = self.points.first().map_or(0, |p| p.energies.len());
        let b = self.buildup;
        let basis = self.model.basis().map_or(String::new(), |b| b.name.clone());
        let mut table = format!(
            "lobecast curve: {}, one electron, basis {basis}; the {k} lowest states at {} separations\n",
            m.formula_with_charge(),
            self.points.len()
        );
        table += &format!("{:>9} {:>9}", "R/bohr", "R/Å");
        let mut csv = format!(
            "# lobecast {} energy curve: {}, one electron, basis {basis}; total energies (nuclear repulsion included) of the {k} lowest states\n\
             # units: r_bohr in bohr, r_angstrom in angstrom, e_N in hartree; e_1 is the lowest\n\
             {}r_bohr,r_angstrom",
            env!("CARGO_PKG_VERSION"),
            m.formula_with_charge(),
            b.map_or("", |_| BUILDUP_CSV_NOTE)
        );
        for i in 1..=k {
            table += &format!(" {:>14}", format!("E{i}/hartree"));
            csv += &format!(",e_{i}");
        }
        if b.is_some() {
            table += &buildup_table_header();
            csv += BUILDUP_CSV_HEADER;
        }
        table += "\n";
        csv += "\n";
        for (i, p) in self.points.iter().enumerate() {
            table += &format!("{:9.4} {:9.4}", p.r, bohr_to_angstrom(p.r));
            csv += &format!("{},{}", p.r, bohr_to_angstrom(p.r));
            for e in &p.energies {
                table += &format!(" {e:14.8}");
                csv += &format!(",{e:.12e}");
            }
            if let Some(b) = b {
                table += &buildup_table_cells(&b[i]);
                csv += &buildup_csv_cells(&b[i]);
            }
            table += "\n";
            csv += "\n";
        }
        let minimal = self.model.basis().is_some_and(|b| b.kind().is_minimal());
        let json = json_text(&Json {
            format: "lobecast-curve",
            version: 1,
            model: self.model.path.display().to_string(),
            basis,
            length_unit: "bohr",
            energy_unit: "hartree",
            separated_limit_hartree: limit,
            equilibrium: self
                .eq
                .map(|(r, e)| EquilibriumJson::new(r, e, limit, None)),
            points: self
                .points
                .iter()
                .enumerate()
                .map(|(i, p)| StatesJsonPoint {
                    r_bohr: p.r,
                    r_angstrom: bohr_to_angstrom(p.r),
                    energies_hartree: p.energies.clone(),
                    buildup: b.map(|b| BuildupJson::from(&b[i])),
                })
                .collect(),
            notes: if minimal {
                vec![MINIMAL_BASIS_CAVEAT.to_string()]
            } else {
                Vec::new()
            },
        });
        Document {
            table,
            equilibrium_line: equilibrium_line(self.eq.map(|(r, e)| (r, e, None)), limit),
            csv,
            json,
            minimal_basis: minimal,
        }
    }
}
