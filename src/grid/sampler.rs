//! The parallel sampler. A box is walked slab by slab (one value of the slowest index
//! at a time): a batch of slabs is evaluated and post-processed in parallel, then
//! handed to the sink in order. Memory stays at a few slabs however large the box.

use rayon::prelude::*;

use super::GridBox;

/// One slab of a box: its points (k fastest) and, when the box is axis-aligned, the
/// lattice coordinates (x, all y, all z) that let separable evaluators skip work.
pub struct Slab<'a> {
    pub points: &'a [[f64; 3]],
    pub lattice: Option<(f64, &'a [f64], &'a [f64])>,
}
use crate::error::Result;

/// Evaluates `eval` (points → `per_point` values each) over the whole box, turns each
/// slab's values into a `T` with `post` in parallel, and passes the `T`s to `sink`
/// in slab order.
pub fn stream_slabs<T, E, P, S>(
    grid: &GridBox,
    per_point: usize,
    eval: E,
    post: P,
    mut sink: S,
) -> Result<()>
where
    T: Send,
    E: Fn(&Slab, &mut [f64]) + Sync,
    P: Fn(&[f64]) -> T + Sync,
    S: FnMut(T) -> Result<()>,
{
    let nx = grid.counts[0];
    let aligned = grid.is_axis_aligned();
    let ys: Vec<f64> = (0..grid.counts[1])
        .map(|j| grid.point(0, j, 0)[1])
        .collect();
    let zs: Vec<f64> = (0..grid.counts[2])
        .map(|k| grid.point(0, 0, k)[2])
        .collect();
    let batch = (2 * rayon::current_num_threads()).max(2);
    let mut start = 0;
    while start < nx {
        let end = (start + batch).min(nx);
        let done: Vec<T> = (start..end)
            .into_par_iter()
            .map(|i| {
                let mut points = Vec::with_capacity(grid.counts[1] * grid.counts[2]);
                grid.slab_points(i, &mut points);
                let mut values = vec![0.0; points.len() * per_point];
                let lattice = aligned.then(|| (grid.point(i, 0, 0)[0], &ys[..], &zs[..]));
                eval(
                    &Slab {
                        points: &points,
                        lattice,
                    },
                    &mut values,
                );
                post(&values)
            })
            .collect();
        for t in done {
            sink(t)?;
        }
        start = end;
    }
    Ok(())
}

/// All values of the box in memory (tests, small grids), in cube order.
pub fn sample_all<E>(grid: &GridBox, per_point: usize, eval: E) -> Vec<f64>
where
    E: Fn(&Slab, &mut [f64]) + Sync,
{
    let mut all = Vec::with_capacity(grid.point_count() * per_point);
    stream_slabs(
        grid,
        per_point,
        eval,
        |v| v.to_vec(),
        |v| {
            all.extend_from_slice(&v);
            Ok(())
        },
    )
    .expect("an in-memory sink cannot fail");
    all
}
