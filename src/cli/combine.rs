//! `lobecast combine`: the weighted sum of cube fields on one grid (differences of
//! densities, bonding minus antibonding, molecule minus fragments), streamed.

use std::path::PathBuf;

use clap::Args;

use lobecast::error::{Error, Result};
use lobecast::io::cube::arith::{
    Term, atoms_difference, compare_grids, stored_units, write_weighted_sum,
};
use lobecast::io::cube::sink::CubeSink;
use lobecast::io::cube::{CubeHeader, CubeReader};
use lobecast::output::OutputPlan;

#[derive(Debug, Args)]
pub struct CombineArgs {
    /// Output cube file (a name ending in .gz is gzip-compressed)
    #[arg(long, value_name = "FILE")]
    pub out: PathBuf,
    /// Inputs as FILE[#FIELD][:WEIGHT], e.g. a.cube:1 b.cube:-1 or c.cube#2:0.5;
    /// FIELD counts the stored fields of a multi-field file from 1; WEIGHT defaults to 1.
    /// A name that contains ':' or '#' is read whole when that file exists, or give
    /// the weight (and field) after it: my:run.cube:1, c#1.cube#1:1
    #[arg(required = true, value_name = "FILE[#FIELD][:WEIGHT]")]
    pub inputs: Vec<String>,
}

/// One parsed input: file, stored field (from 0, if given) and weight.
#[derive(Debug, Clone, PartialEq)]
pub struct InputSpec {
    pub path: PathBuf,
    pub field: Option<usize>,
    pub weight: f64,
}

impl InputSpec {
    pub fn parse(s: &str) -> Result<Self> {
        // An existing file is taken whole, so names with ':' or '#' need no escape.
        if std::path::Path::new(s).is_file() {
            return Ok(InputSpec {
                path: PathBuf::from(s),
                field: None,
                weight: 1.0,
            });
        }
        let bad = |why: &str| {
            Error::input(format!("cannot read the input '{s}': {why}")).with_hint(
                "write inputs as FILE[#FIELD][:WEIGHT], e.g. a.cube:1 b.cube#2:-0.5; for a name with ':' or '#', give the weight after it: my:run.cube:1",
            )
        };
        let (rest, weight) = match s.rsplit_once(':') {
            Some((p, w)) => match w.trim().parse::<f64>() {
                Ok(x) if x.is_finite() => (p, x),
                _ => return Err(bad(&format!("the weight '{w}' is not a finite number"))),
            },
            None => (s, 1.0),
        };
        let (path, field) = match rest.rsplit_once('#') {
            Some((p, f)) => match f.parse::<usize>() {
                Ok(n) if n >= 1 => (p, Some(n - 1)),
                _ => return Err(bad(&format!("the field '{f}' is not a number from 1"))),
            },
            None => (rest, None),
        };
        if path.is_empty() {
            return Err(bad("no file name"));
        }
        Ok(InputSpec {
            path: PathBuf::from(path),
            field,
            weight,
        })
    }
}

/// "+1×a.cube −0.5×b.cube#2" for the title line and the report.
fn describe(specs: &[InputSpec]) -> String {
    specs
        .iter()
        .map(|s| {
            let sign = if s.weight < 0.0 { '−' } else { '+' };
            let field = s.field.map_or(String::new(), |f| format!("#{}", f + 1));
            format!("{sign}{}×{}{field}", s.weight.abs(), s.path.display())
        })
        .collect::<Vec<_>>()
        .join(" ")
}

pub fn run(args: CombineArgs) -> Result<()> {
    let specs = args
        .inputs
        .iter()
        .map(|s| InputSpec::parse(s))
        .collect::<Result<Vec<_>>>()?;
    let inputs: Vec<PathBuf> = specs.iter().map(|s| s.path.clone()).collect();
    let mut plan = OutputPlan::new(&inputs);
    let slot = plan.add(&args.out)?;
    let mut terms = Vec::with_capacity(specs.len());
    for s in &specs {
        let reader = CubeReader::open(&s.path)?;
        let n = reader.info().fields;
        let field = match s.field {
            Some(f) if f < n => f,
            Some(f) => {
                return Err(Error::input(format!(
                    "{} holds {n} field(s); there is no field {}",
                    s.path.display(),
                    f + 1
                )));
            }
            None if n == 1 => 0,
            None => {
                return Err(Error::input(format!(
                    "{} holds {n} fields; say which one to take",
                    s.path.display()
                ))
                .with_hint(format!("write {}#N with N from 1 to {n}", s.path.display())));
            }
        };
        terms.push(Term {
            reader,
            field,
            weight: s.weight,
        });
    }
    let first = terms[0].reader.info().header.clone();
    for t in &terms[1..] {
        let h = &t.reader.info().header;
        compare_grids(
            &first.grid,
            &h.grid,
            terms[0].reader.name(),
            t.reader.name(),
        )?;
        if let Some(d) = atoms_difference(&first.atoms, &h.atoms) {
            eprintln!(
                "warning: the atoms of {} and {} differ ({d}); the output keeps those of {}",
                terms[0].reader.name(),
                t.reader.name(),
                terms[0].reader.name()
            );
        }
    }
    let unit = sum_unit(&terms);
    let what = describe(&specs);
    let header = CubeHeader {
        title: format!("lobecast combine: {what}"),
        comment: format!(
            "weighted sum of cube fields on a common grid, {unit}; lobecast {}",
            env!("CARGO_PKG_VERSION")
        ),
        atoms: first.atoms.clone(),
        grid: first.grid.clone(),
        orbital_numbers: None,
    };
    header.check_fits()?;
    let mut out = plan.open()?;
    {
        let mut sink = CubeSink::new(out.writer(slot), &args.out);
        write_weighted_sum(&header, &mut terms, &mut sink)?;
        sink.finish()?;
    }
    let written = out.commit()?.remove(0);
    let [nx, ny, nz] = header.grid.counts;
    super::common::print_out(&format!(
        "wrote {written}: {what} on {nx}×{ny}×{nz} points\n"
    ))
}

/// The unit of the sum for the comment line: the inputs' common unit, or a warning
/// (printed) when an orbital (bohr^-3/2) is added to a density (e/bohr^3) — such a
/// sum has no physical meaning, but a user may want it as a picture.
fn sum_unit(terms: &[Term]) -> String {
    let units: Vec<(String, Option<&str>)> = terms
        .iter()
        .map(|t| {
            let info = t.reader.info();
            let u = stored_units(&info.header.comment, info.fields)[t.field];
            (t.reader.name().to_string(), u)
        })
        .collect();
    let known: Vec<&str> = units.iter().filter_map(|(_, u)| *u).collect();
    if known.len() < units.len() {
        return "in the units of the inputs".into();
    }
    if known.iter().all(|u| *u == known[0]) {
        return format!("in {}", known[0]);
    }
    let list = units
        .iter()
        .map(|(n, u)| format!("{n} in {}", u.unwrap_or("?")))
        .collect::<Vec<_>>()
        .join(", ");
    eprintln!("warning: the inputs have different units ({list}); their sum has no physical unit");
    format!("mixed units ({})", known.join(" and "))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn input_specs() {
        let p = |s| InputSpec::parse(s);
        assert_eq!(
            p("a.cube:-1").unwrap(),
            InputSpec {
                path: "a.cube".into(),
                field: None,
                weight: -1.0
            }
        );
        assert_eq!(p("dir/b.cube#2:0.5").unwrap().field, Some(1));
        assert_eq!(p("c.cube").unwrap().weight, 1.0);
        for bad in ["a.cube:x", "a.cube#0:1", "a.cube#two", ":1", "a.cube:inf"] {
            assert!(p(bad).is_err(), "{bad}");
        }
    }
}
