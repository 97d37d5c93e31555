//! Command-line values for library enums: the library parses its own names
//! (`FromStr`); clap only learns which names exist, for help and completion, so no
//! clap derive sits on a library type.

use clap::builder::{PossibleValuesParser, TypedValueParser};

use lobecast::chem::LengthUnit;
use lobecast::grid::plane::Axis;
use lobecast::io::cube::stats::Measure;

fn choice<T>(names: &'static [&'static str]) -> impl TypedValueParser<Value = T>
where
    T: std::str::FromStr<Err = String> + Clone + Send + Sync + 'static,
{
    PossibleValuesParser::new(names).try_map(|s| s.parse::<T>())
}

pub fn channel() -> impl TypedValueParser<Value = lobecast::solve::orbitals::Channel> {
    choice(&["alpha", "beta"])
}

pub fn angular_form() -> impl TypedValueParser<Value = lobecast::basis::named::AngularForm> {
    choice(&["pure", "cartesian"])
}

pub fn guess() -> impl TypedValueParser<Value = lobecast::solve::scf::Guess> {
    choice(&["atoms", "core"])
}

pub fn length_unit() -> impl TypedValueParser<Value = LengthUnit> {
    choice(&["angstrom", "bohr"])
}

pub fn axis() -> impl TypedValueParser<Value = Axis> {
    choice(&["x", "y", "z"])
}

pub fn measure() -> impl TypedValueParser<Value = Measure> {
    choice(&["abs", "square"])
}
