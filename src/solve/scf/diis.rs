//! Pulay's direct inversion in the iterative subspace (P. Pulay, J. Comput. Chem. 3,
//! 556 (1982)): the next Fock matrices are the combination of the last few whose
//! error vectors (the orbital gradients FDS − SDF) combine to the smallest norm,
//! with coefficients summing to one.

use nalgebra::{DMatrix, DVector};

/// Fock matrices (one per spin channel) and their error vectors, newest last.
pub struct Diis {
    size: usize,
    focks: Vec<Vec<DMatrix<f64>>>,
    errors: Vec<Vec<DMatrix<f64>>>,
}

impl Diis {
    /// Keeps the last `size` iterations (8 is common practice).
    pub fn new(size: usize) -> Self {
        Diis {
            size: size.max(2),
            focks: Vec::new(),
            errors: Vec::new(),
        }
    }

    pub fn clear(&mut self) {
        self.focks.clear();
        self.errors.clear();
    }

    /// Stores this iteration's Fock matrices and errors and returns the
    /// extrapolated Fock matrices (the given ones while the subspace is one deep or
    /// the DIIS equations are singular).
    pub fn extrapolate(
        &mut self,
        focks: &[DMatrix<f64>],
        errors: &[DMatrix<f64>],
    ) -> Vec<DMatrix<f64>> {
        if self.focks.len() == self.size {
            self.focks.remove(0);
            self.errors.remove(0);
        }
        self.focks.push(focks.to_vec());
        self.errors.push(errors.to_vec());
        let m = self.focks.len();
        if m < 2 {
            return focks.to_vec();
        }
        // B_ij = Σ_channels ⟨e_i, e_j⟩, bordered by the constraint Σ c_i = 1.
        let mut b = DMatrix::zeros(m + 1, m + 1);
        for i in 0..m {
            for j in 0..=i {
                let v: f64 = self.errors[i]
                    .iter()
                    .zip(&self.errors[j])
                    .map(|(a, b)| a.dot(b))
                    .sum();
                b[(i, j)] = v;
                b[(j, i)] = v;
            }
            b[(i, m)] = -1.0;
            b[(m, i)] = -1.0;
        }
        // Scale by the largest diagonal so the solve is well conditioned.
        let scale = (0..m).map(|i| b[(i, i)]).fold(0.0f64, f64::max);
        if !(scale > 0.0 && scale.is_finite()) {
            return focks.to_vec();
        }
        for i in 0..m {
            for j in 0..m {
                b[(i, j)] /= scale;
            }
        }
        let mut rhs = DVector::zeros(m + 1);
        rhs[m] = -1.0;
        let Some(c) = b.lu().solve(&rhs) else {
            // A singular subspace: drop the oldest entry and use the plain matrices.
            self.focks.remove(0);
            self.errors.remove(0);
            return focks.to_vec();
        };
        if c.iter().any(|v| !v.is_finite()) {
            self.clear();
            return focks.to_vec();
        }
        (0..focks.len())
            .map(|ch| {
                let mut f = DMatrix::zeros(focks[ch].nrows(), focks[ch].ncols());
                for (i, set) in self.focks.iter().enumerate() {
                    f += &set[ch] * c[i];
                }
                f
            })
            .collect()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// For errors that are linear in the Fock matrix, e(F) = F − F*, DIIS finds the
    /// combination with zero error exactly when F* lies in the affine span of the
    /// stored matrices (the defining property of the method, Pulay 1982).
    #[test]
    fn recovers_the_fixed_point_of_a_linear_error() {
        let target = DMatrix::from_row_slice(2, 2, &[1.0, 0.3, 0.3, -0.5]);
        let f1 = DMatrix::from_row_slice(2, 2, &[0.0, 0.0, 0.0, 0.0]);
        let f2 = DMatrix::from_row_slice(2, 2, &[2.0, 0.6, 0.6, -1.0]);
        let mut d = Diis::new(8);
        d.extrapolate(std::slice::from_ref(&f1), &[&f1 - &target]);
        let out = d.extrapolate(std::slice::from_ref(&f2), &[&f2 - &target]);
        assert!((&out[0] - &target).norm() < 1e-12, "{}", out[0]);
    }
}
