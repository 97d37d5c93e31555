//! J and K recomputed from the integrals on every call, never stored: memory O(n²)
//! for any basis. Each canonical shell quartet (AB|CD), A ≥ B, AB ≥ CD, is skipped
//! when its Schwarz bound times the largest density element it meets,
//! Q_AB Q_CD max(2|D_AB|, 2|D_CD|, |D_AC|, |D_AD|, |D_BC|, |D_BD|), is below the
//! threshold (Almlöf, Faegri, Korsell, J. Comput. Chem. 3, 385 (1982)): fed density
//! *changes*, as an incremental SCF does, most quartets fall away.

use nalgebra::DMatrix;
use rayon::prelude::*;

use super::accumulate::{Acc, chunk_count, density_slices, split_by_weight};
use super::packed::PRIMITIVE_SHARE;
use super::pair::ShellPair;
use super::quartet::{Scratch, contract};
use super::screen::{canonical_pairs, pair_bounds};
use super::{TwoElectron, gaussian_shells, tri};
use crate::basis::Basis;
use crate::error::Result;

/// Direct, screened J/K builder for one basis.
pub struct DirectJk {
    n: usize,
    threshold: f64,
    offsets: Vec<usize>,
    sizes: Vec<usize>,
    pairs: Vec<ShellPair>,
    q: Vec<f64>,
}

impl DirectJk {
    /// Precomputes the shell-pair expansions and Schwarz bounds.
    pub fn new(basis: &Basis, threshold: f64) -> Result<DirectJk> {
        let shells = gaussian_shells(basis)?;
        let pairs = canonical_pairs(&shells)?;
        let q = pair_bounds(&pairs);
        Ok(DirectJk {
            n: basis.len(),
            threshold,
            offsets: basis.offsets(),
            sizes: shells.iter().map(|s| s.rows.len()).collect(),
            pairs,
            q,
        })
    }

    /// max |D| over every shell-pair block and density, nshell × nshell row-major.
    fn block_max(&self, dens: &[&[f64]]) -> Vec<f64> {
        let (n, ns) = (self.n, self.sizes.len());
        let mut out = vec![0.0f64; ns * ns];
        for a in 0..ns {
            for b in 0..ns {
                let mut m = 0.0f64;
                for d in dens {
                    for i in self.offsets[a]..self.offsets[a] + self.sizes[a] {
                        for j in self.offsets[b]..self.offsets[b] + self.sizes[b] {
                            m = m.max(d[i * n + j].abs());
                        }
                    }
                }
                out[a * ns + b] = m;
            }
        }
        out
    }
}

impl TwoElectron for DirectJk {
    fn jk(&self, densities: &[&DMatrix<f64>]) -> Vec<(DMatrix<f64>, DMatrix<f64>)> {
        let n = self.n;
        let dens = density_slices(n, densities);
        let ns = self.sizes.len();
        let dmax = self.block_max(&dens);
        let dm = |a: usize, b: usize| dmax[a * ns + b];
        let dglobal = dmax.iter().cloned().fold(0.0f64, f64::max);
        let qmax = self.q.iter().cloned().fold(0.0f64, f64::max);
        // Bra pairs (a, b) that can matter at all, with their share of the work.
        let bras: Vec<(usize, usize)> = (0..ns)
            .flat_map(|a| (0..=a).map(move |b| (a, b)))
            .filter(|&(a, b)| 2.0 * self.q[tri(a, b)] * qmax * dglobal >= self.threshold)
            .collect();
        let weights: Vec<f64> = bras.iter().map(|&(a, b)| (tri(a, b) + 1) as f64).collect();
        let chunks = split_by_weight(&weights, chunk_count(n, dens.len()));
        let parts: Vec<Acc> = chunks
            .into_par_iter()
            .map(|range| {
                let mut acc = Acc::new(n, dens.len());
                let mut scratch = Scratch::default();
                for &(a, b) in &bras[range] {
                    let ab = tri(a, b);
                    for c in 0..=a {
                        for d in 0..=(if c == a { b } else { c }) {
                            let cd = tri(c, d);
                            let dens_max = (2.0 * dm(a, b).max(dm(c, d)))
                                .max(dm(a, c).max(dm(a, d)))
                                .max(dm(b, c).max(dm(b, d)));
                            if self.q[ab] * self.q[cd] * dens_max < self.threshold {
                                continue;
                            }
                            let block = contract(
                                &self.pairs[ab],
                                &self.pairs[cd],
                                self.threshold * PRIMITIVE_SHARE / dens_max,
                                &mut scratch,
                            );
                            let s = [a, b, c, d].map(|s| (self.offsets[s], self.sizes[s]));
                            accumulate(&mut acc, &dens, block, s);
                        }
                    }
                }
                acc
            })
            .collect();
        super::accumulate::combine(&parts, n, dens.len())
    }

    fn describe(&self) -> String {
        format!(
            "direct J/K, Schwarz- and density-screened at {:.0e} ({} shell pairs)",
            self.threshold,
            self.pairs.len()
        )
    }
}

/// Adds the unique function quartets of one canonical shell quartet.
fn accumulate(acc: &mut Acc, dens: &[&[f64]], block: &[f64], s: [(usize, usize); 4]) {
    let [(oa, na), (ob, nb), (oc, nc), (od, nd)] = s;
    let (same_ab, same_cd, same_pair) = (oa == ob, oc == od, oa == oc && ob == od);
    for fa in 0..na {
        for fb in 0..if same_ab { fa + 1 } else { nb } {
            let (i, j) = (oa + fa, ob + fb);
            let ij = tri(i, j);
            let row = &block[(fa * nb + fb) * nc * nd..];
            for fc in 0..nc {
                for fd in 0..if same_cd { fc + 1 } else { nd } {
                    let (k, l) = (oc + fc, od + fd);
                    let kl = tri(k, l);
                    if same_pair && kl > ij {
                        continue;
                    }
                    let v = row[fc * nd + fd];
                    if ij >= kl {
                        acc.add(dens, i, j, k, l, v);
                    } else {
                        acc.add(dens, k, l, i, j, v);
                    }
                }
            }
        }
    }
}
