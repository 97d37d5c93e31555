//! J and K from unique integrals. A unique (ij|kl) (i ≥ j, k ≥ l, ij ≥ kl) stands
//! for up to eight equal integrals; with v′ = v · ½^(i=j) · ½^(k=l) · ½^(ij=kl) the
//! eight images contribute J_ij += 4v′D_kl, J_kl += 4v′D_ij, K_ik += 2v′D_jl,
//! K_jk += 2v′D_il, K_il += 2v′D_jk, K_jl += 2v′D_ik, provided J and K are
//! symmetrised (M + Mᵀ)/2 at the end (the images come in transposed pairs).
//!
//! Work is split into a fixed number of chunks, each with its own accumulator,
//! summed in chunk order: for a given number of threads the result does not depend
//! on which thread ran what (bit for bit the same from run to run).

use nalgebra::DMatrix;

/// Accumulators per density, row-major n × n.
pub(super) struct Acc {
    n: usize,
    j: Vec<Vec<f64>>,
    k: Vec<Vec<f64>>,
}

impl Acc {
    pub fn new(n: usize, nd: usize) -> Acc {
        Acc {
            n,
            j: vec![vec![0.0; n * n]; nd],
            k: vec![vec![0.0; n * n]; nd],
        }
    }

    /// Adds the unique integral v = (ij|kl), i ≥ j, k ≥ l, (i, j) ≥ (k, l).
    #[inline]
    pub fn add(&mut self, dens: &[&[f64]], i: usize, j: usize, k: usize, l: usize, v: f64) {
        let mut v = v;
        if i == j {
            v *= 0.5;
        }
        if k == l {
            v *= 0.5;
        }
        if i == k && j == l {
            v *= 0.5;
        }
        let n = self.n;
        let (j4, k2) = (4.0 * v, 2.0 * v);
        for ((d, jm), km) in dens.iter().zip(&mut self.j).zip(&mut self.k) {
            jm[i * n + j] += j4 * d[k * n + l];
            jm[k * n + l] += j4 * d[i * n + j];
            km[i * n + k] += k2 * d[j * n + l];
            km[j * n + k] += k2 * d[i * n + l];
            km[i * n + l] += k2 * d[j * n + k];
            km[j * n + l] += k2 * d[i * n + k];
        }
    }

    pub fn add_from(&mut self, other: &Acc) {
        for (a, b) in self
            .j
            .iter_mut()
            .zip(&other.j)
            .chain(self.k.iter_mut().zip(&other.k))
        {
            for (x, y) in a.iter_mut().zip(b) {
                *x += y;
            }
        }
    }

    /// Symmetrised (J, K) per density.
    pub fn finish(self) -> Vec<(DMatrix<f64>, DMatrix<f64>)> {
        let n = self.n;
        let sym = |m: &[f64]| DMatrix::from_fn(n, n, |r, c| 0.5 * (m[r * n + c] + m[c * n + r]));
        self.j
            .iter()
            .zip(&self.k)
            .map(|(j, k)| (sym(j), sym(k)))
            .collect()
    }
}

/// Chunks to split J/K work into: enough for load balance on this pool, few enough
/// that the accumulators (two n × n matrices per density each) stay under 256 MiB.
pub(super) fn chunk_count(n: usize, nd: usize) -> usize {
    let per = (2 * nd.max(1)) as f64 * (n * n) as f64 * 8.0;
    let cap = ((256u64 << 20) as f64 / per.max(1.0)).floor() as usize;
    (4 * rayon::current_num_threads()).min(cap).max(1)
}

/// Checks the densities and returns them as slices (column-major equals row-major
/// for a symmetric matrix).
pub(super) fn density_slices<'a>(n: usize, densities: &[&'a DMatrix<f64>]) -> Vec<&'a [f64]> {
    densities
        .iter()
        .map(|d| {
            assert_eq!(d.shape(), (n, n), "density matrix must be {n} × {n}");
            d.as_slice()
        })
        .collect()
}

/// Splits 0..weights.len() into at most `m` consecutive ranges of similar total weight.
pub(super) fn split_by_weight(weights: &[f64], m: usize) -> Vec<std::ops::Range<usize>> {
    let total: f64 = weights.iter().sum();
    let mut out = Vec::with_capacity(m);
    let (mut start, mut acc) = (0, 0.0);
    for (i, w) in weights.iter().enumerate() {
        acc += w;
        if acc >= total * (out.len() + 1) as f64 / m as f64 && out.len() + 1 < m {
            out.push(start..i + 1);
            start = i + 1;
        }
    }
    if start < weights.len() || out.is_empty() {
        out.push(start..weights.len());
    }
    out
}

/// Sums the per-thread accumulators and finishes J and K (the one reduction both
/// J/K builders share).
pub fn combine(parts: &[Acc], n: usize, nd: usize) -> Vec<(DMatrix<f64>, DMatrix<f64>)> {
    let mut total = Acc::new(n, nd);
    for p in parts {
        total.add_from(p);
    }
    total.finish()
}
