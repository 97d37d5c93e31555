//! Numerical methods that know no chemistry: Gauss–Legendre quadrature and Brent's
//! one-dimensional minimisation. Every other room may use them; they use none.

pub mod brent;
pub mod quadrature;
