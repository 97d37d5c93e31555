//! The generalised symmetric eigenproblem H C = S C ε by symmetric (Löwdin)
//! orthogonalisation, dropping near-linear-dependent combinations of the basis.

use nalgebra::{DMatrix, DVector, SymmetricEigen};

use crate::error::{Error, Result};

/// Overlap eigenvalues below this are treated as linear dependence (common practice
/// for double-precision work: about 1e-7 keeps the transformed H well conditioned).
pub const DEPENDENCE_THRESHOLD: f64 = 1e-7;

#[derive(Debug, Clone)]
pub struct Eigen {
    /// Eigenvalues in increasing order.
    pub values: Vec<f64>,
    /// Coefficient vectors, one column per eigenvalue, normalised so that cᵀSc = 1.
    pub vectors: DMatrix<f64>,
    /// How many combinations of the basis were dropped as linearly dependent.
    pub dropped: usize,
}

/// Solves H C = S C ε. Each vector's sign is fixed so that its largest coefficient is
/// positive (the first of equal ones), which makes output reproducible.
impl Eigen {
    /// The orbitals: each eigenvalue with its occupation and coefficient column.
    pub fn orbitals(&self, occupations: &[f64]) -> Vec<super::Orbital> {
        self.values
            .iter()
            .zip(occupations)
            .enumerate()
            .map(|(i, (&energy, &occupation))| super::Orbital {
                energy,
                occupation,
                coefficients: self.vectors.column(i).iter().copied().collect(),
            })
            .collect()
    }
}

pub fn generalized_symmetric(h: &DMatrix<f64>, s: &DMatrix<f64>, threshold: f64) -> Result<Eigen> {
    let n = s.nrows();
    if n == 0 || s.ncols() != n || h.shape() != s.shape() {
        return Err(Error::internal(
            "H and S must be square matrices of the same size",
        ));
    }
    let se = SymmetricEigen::new(s.clone());
    let keep: Vec<usize> = (0..n).filter(|&i| se.eigenvalues[i] > threshold).collect();
    if keep.is_empty() {
        return Err(Error::input(
            "the overlap matrix has no positive eigenvalues",
        ));
    }
    let mut x = DMatrix::zeros(n, keep.len());
    for (col, &i) in keep.iter().enumerate() {
        let scale = 1.0 / se.eigenvalues[i].sqrt();
        x.set_column(col, &(se.eigenvectors.column(i) * scale));
    }
    let h_ortho = x.transpose() * h * &x;
    let he = SymmetricEigen::new(h_ortho);
    let mut order: Vec<usize> = (0..keep.len()).collect();
    order.sort_by(|&a, &b| he.eigenvalues[a].total_cmp(&he.eigenvalues[b]));
    let mut vectors = DMatrix::zeros(n, keep.len());
    let mut values = Vec::with_capacity(keep.len());
    for (col, &i) in order.iter().enumerate() {
        let mut c: DVector<f64> = &x * he.eigenvectors.column(i);
        fix_sign(&mut c);
        vectors.set_column(col, &c);
        values.push(he.eigenvalues[i]);
    }
    Ok(Eigen {
        values,
        vectors,
        dropped: n - keep.len(),
    })
}

pub(crate) fn fix_sign(c: &mut DVector<f64>) {
    let max = c.iter().fold(0.0f64, |m, v| m.max(v.abs()));
    if let Some(first) = c.iter().find(|v| v.abs() > max * (1.0 - 1e-9)) {
        if *first < 0.0 {
            c.neg_mut();
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A 2×2 problem with the known solution (a ± b)/(1 ± s) (the secular equation of
    /// a symmetric dimer; common practice).
    #[test]
    fn dimer_secular_equation() {
        let (a, b, s) = (-1.2, -0.4, 0.3);
        let h = DMatrix::from_row_slice(2, 2, &[a, b, b, a]);
        let sm = DMatrix::from_row_slice(2, 2, &[1.0, s, s, 1.0]);
        let e = generalized_symmetric(&h, &sm, DEPENDENCE_THRESHOLD).unwrap();
        assert!((e.values[0] - (a + b) / (1.0 + s)).abs() < 1e-14);
        assert!((e.values[1] - (a - b) / (1.0 - s)).abs() < 1e-14);
        let c1 = e.vectors.column(1);
        assert!(c1[0] > 0.0 && c1[1] < 0.0, "antibonding sign convention");
        let norm = (c1.transpose() * &sm * c1)[(0, 0)];
        assert!((norm - 1.0).abs() < 1e-14);
    }

    #[test]
    fn drops_a_duplicated_function() {
        let sm = DMatrix::from_row_slice(2, 2, &[1.0, 1.0, 1.0, 1.0]);
        let h = DMatrix::from_row_slice(2, 2, &[-0.5, -0.5, -0.5, -0.5]);
        let e = generalized_symmetric(&h, &sm, DEPENDENCE_THRESHOLD).unwrap();
        assert_eq!(e.dropped, 1);
        assert!((e.values[0] + 0.5).abs() < 1e-12);
    }
}
