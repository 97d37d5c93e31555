//! Numerical methods that know no chemistry: Gauss–Legendre quadrature, Brent's
//! one-dimensional minimisation, and e^x over whole slices with the library's bits.
//! Every other room may use them; they use none.

pub mod brent;
pub mod exp;
pub mod quadrature;
