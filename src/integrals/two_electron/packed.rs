//! All unique integrals in memory: (ij|kl) for i ≥ j, k ≥ l, ij ≥ kl at
//! tri(tri(i, j), tri(k, l)), so 8-fold symmetry stores n⁴/8 values.
//!
//! The store is filled in parallel without locks: a unique function quartet's first
//! index is its largest, so it lies in the shell A holding that index, and the
//! values whose largest index is in A form one contiguous range of the store. Each
//! task owns one such range and computes the canonical shell quartets (AB|CD),
//! A ≥ B, AB ≥ CD, that land in it.

use std::sync::Mutex;

use nalgebra::DMatrix;
use rayon::prelude::*;

use super::accumulate::{Acc, chunk_count, density_slices, split_by_weight};
use super::quartet::{Scratch, contract};
use super::screen::{canonical_pairs, pair_bounds};
use super::{TwoElectron, gaussian_shells, tri};
use crate::basis::Basis;
use crate::budget;
use crate::error::{Error, Result};

/// Primitive quartets are dropped below this fraction of the quartet threshold.
/// Their bound is rigorous, so an integral moves by at most threshold × 1e-3 ×
/// its number of primitive quartets (1296 for four 6-primitive s shells: about
/// the threshold itself, the size of what Schwarz screening drops anyway).
pub(crate) const PRIMITIVE_SHARE: f64 = 1e-3;

/// The unique electron-repulsion integrals of a basis of n functions.
pub struct PackedEri {
    n: usize,
    values: Vec<f64>,
}

impl PackedEri {
    /// Bytes the store needs for n functions; `None` if that overflows u64.
    pub fn bytes_for(n: usize) -> Option<u64> {
        let n = u64::try_from(n).ok()?;
        let pairs = n.checked_mul(n.checked_add(1)?)? / 2;
        let len = pairs.checked_mul(pairs.checked_add(1)?)? / 2;
        len.checked_mul(8)
    }

    /// Computes every unique integral; quartets with Q_AB Q_CD < `threshold`
    /// (Schwarz bound) are stored as 0. `progress` receives the fraction done.
    pub fn build(
        basis: &Basis,
        threshold: f64,
        progress: &mut (dyn FnMut(f64) + Send),
    ) -> Result<PackedEri> {
        let shells = gaussian_shells(basis)?;
        let n = basis.len();
        let len = Self::bytes_for(n)
            .and_then(|b| usize::try_from(b / 8).ok())
            .ok_or_else(|| Error::input(format!("{n} basis functions are too many to store")))?;
        let mut values = Vec::new();
        budget::reserve(&mut values, len, "the in-core electron-repulsion integrals")?;
        values.resize(len, 0.0);
        let pairs = canonical_pairs(&shells)?;
        let q = pair_bounds(&pairs);
        let offsets = basis.offsets();
        let sizes: Vec<usize> = shells.iter().map(|s| s.rows.len()).collect();
        // One contiguous range of the store per shell A.
        let mut tasks = Vec::with_capacity(shells.len());
        let mut rest = values.as_mut_slice();
        let mut at = 0;
        for a in 0..shells.len() {
            let end = tri(tri(offsets[a] + sizes[a], 0), 0);
            let (mine, tail) = rest.split_at_mut(end - at);
            tasks.push((a, at, mine));
            rest = tail;
            at = end;
        }
        tasks.reverse(); // the largest first
        let total = len.max(1) as f64;
        let report = Mutex::new((0usize, progress));
        tasks
            .into_par_iter()
            .for_each_init(Scratch::default, |scratch, (a, start, out)| {
                for b in 0..=a {
                    let ab = tri(a, b);
                    for c in 0..=a {
                        for d in 0..=(if c == a { b } else { c }) {
                            let cd = tri(c, d);
                            if q[ab] * q[cd] < threshold {
                                continue;
                            }
                            let block = contract(
                                &pairs[ab],
                                &pairs[cd],
                                threshold * PRIMITIVE_SHARE,
                                scratch,
                            );
                            let shells4 = [a, b, c, d].map(|s| (offsets[s], sizes[s]));
                            store(block, shells4, start, out);
                        }
                    }
                }
                let mut r = report.lock().unwrap_or_else(|e| e.into_inner());
                r.0 += out.len();
                let done = r.0 as f64 / total;
                (r.1)(done);
            });
        Ok(PackedEri { n, values })
    }

    /// (ij|kl) for any order of the indices (each < n).
    #[inline]
    pub fn get(&self, i: usize, j: usize, k: usize, l: usize) -> f64 {
        let (ij, kl) = (tri(i.max(j), i.min(j)), tri(k.max(l), k.min(l)));
        self.values[tri(ij.max(kl), ij.min(kl))]
    }

    /// Number of stored values.
    pub fn len(&self) -> usize {
        self.values.len()
    }

    pub fn is_empty(&self) -> bool {
        self.values.is_empty()
    }

    /// Number of basis functions.
    pub fn functions(&self) -> usize {
        self.n
    }
}

/// Writes the unique function quartets of one canonical shell quartet (offset and
/// size of shells A, B, C, D) into the range of the store starting at `start`.
fn store(block: &[f64], s: [(usize, usize); 4], start: usize, out: &mut [f64]) {
    let [(oa, na), (ob, nb), (oc, nc), (od, nd)] = s;
    let (same_ab, same_cd, same_pair) = (oa == ob, oc == od, oa == oc && ob == od);
    for fa in 0..na {
        for fb in 0..if same_ab { fa + 1 } else { nb } {
            let ij = tri(oa + fa, ob + fb);
            let row = &block[(fa * nb + fb) * nc * nd..];
            for fc in 0..nc {
                for fd in 0..if same_cd { fc + 1 } else { nd } {
                    let kl = tri(oc + fc, od + fd);
                    if same_pair && kl > ij {
                        continue;
                    }
                    out[tri(ij.max(kl), ij.min(kl)) - start] = row[fc * nd + fd];
                }
            }
        }
    }
}

impl TwoElectron for PackedEri {
    fn jk(&self, densities: &[&DMatrix<f64>]) -> Vec<(DMatrix<f64>, DMatrix<f64>)> {
        let n = self.n;
        let dens = density_slices(n, densities);
        let npair = n * (n + 1) / 2;
        // Row ij holds ij + 1 values.
        let weights: Vec<f64> = (0..npair).map(|ij| (ij + 1) as f64).collect();
        let chunks = split_by_weight(&weights, chunk_count(n, dens.len()));
        let parts: Vec<Acc> = chunks
            .into_par_iter()
            .map(|rows| {
                let mut acc = Acc::new(n, dens.len());
                if rows.is_empty() {
                    return acc;
                }
                // (i, j) of the first row, then stepped along.
                let (mut i, mut j) = (0, rows.start);
                while j > i {
                    j -= i + 1;
                    i += 1;
                }
                for ij in rows {
                    let vals = &self.values[tri(ij, 0)..=tri(ij, ij)];
                    let (mut k, mut l) = (0, 0);
                    for &v in vals {
                        if v != 0.0 {
                            acc.add(&dens, i, j, k, l, v);
                        }
                        l += 1;
                        if l > k {
                            k += 1;
                            l = 0;
                        }
                    }
                    j += 1;
                    if j > i {
                        i += 1;
                        j = 0;
                    }
                }
                acc
            })
            .collect();
        super::accumulate::combine(&parts, n, dens.len())
    }

    fn describe(&self) -> String {
        let bytes = self.values.len() as f64 * 8.0;
        let n = self.values.len();
        let count = if n >= 100_000 {
            format!("{:.1} million", n as f64 / 1e6)
        } else {
            n.to_string()
        };
        format!(
            "stored in memory ({count} unique integrals, {})",
            budget::show_bytes(bytes)
        )
    }
}
