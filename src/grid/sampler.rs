//! The parallel sampler. A box is walked slab by slab (one value of the slowest index
//! at a time) as an ordered, bounded pipeline: a producer thread evaluates and
//! post-processes a batch of slabs in parallel (rayon) while the calling thread hands
//! the previous batch to the sink in order. So evaluation and writing overlap, the
//! sink may hold non-`Send` state (a `&mut dyn Write`), and at most three batches
//! exist at once however large the box.
//!
//! Why a producer thread and batches rather than an ordered `par_bridge`: rayon
//! workers then never block on the sink (no deadlock when the sink itself uses rayon,
//! as parallel gzip does), a failing sink stops the producer at the next batch, and
//! batch buffers are recycled instead of allocated per slab.

use std::ops::Range;
use std::sync::Mutex;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::mpsc::{channel, sync_channel};

use rayon::prelude::*;

use super::GridBox;
use crate::error::Result;

/// One slab of a box: its points (k fastest) and, when the box is axis-aligned, the
/// lattice coordinates (x, all y, all z) that let separable evaluators skip work.
/// The sampler lists the points of skewed boxes only: on an axis-aligned box they
/// are (x, y_j, z_k), which evaluators that work from the lattice never need, and
/// [`Slab::points`] builds them for those that do.
pub struct Slab<'a> {
    points: &'a [[f64; 3]],
    pub lattice: Option<(f64, &'a [f64], &'a [f64])>,
}

impl<'a> Slab<'a> {
    /// A slab of `points`, or of the lattice (x, ys, zs) whose points are (x, y_j,
    /// z_k) with k fastest; `points` may then be empty.
    pub fn new(points: &'a [[f64; 3]], lattice: Option<(f64, &'a [f64], &'a [f64])>) -> Self {
        Slab { points, lattice }
    }

    /// Number of points.
    pub fn len(&self) -> usize {
        match self.lattice {
            Some((_, ys, zs)) if self.points.is_empty() => ys.len() * zs.len(),
            _ => self.points.len(),
        }
    }

    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// The points, k fastest: the listed ones, or the lattice's built into `buf`.
    /// On an axis-aligned box these are the very numbers `GridBox::point` gives (the
    /// off-axis terms add exact zeros; checked by test).
    pub fn points<'b>(&'b self, buf: &'b mut Vec<[f64; 3]>) -> &'b [[f64; 3]] {
        match self.lattice {
            Some((x, ys, zs)) if self.points.is_empty() => {
                buf.clear();
                buf.extend(ys.iter().flat_map(|&y| zs.iter().map(move |&z| [x, y, z])));
                buf
            }
            _ => self.points,
        }
    }
}

/// Slabs per batch: enough for every thread to have two, so the batch's end waits
/// little on its slowest slab.
fn batch_len() -> usize {
    (2 * rayon::current_num_threads()).max(2)
}

/// Per-thread scratch (points and values of one slab), allocated once per thread
/// and reused for every slab that thread evaluates.
struct Scratch {
    points: Vec<[f64; 3]>,
    values: Vec<f64>,
}

/// Evaluates slabs with per-thread scratch. The lattice coordinates are computed once.
struct Evaluator<'g, E> {
    grid: &'g GridBox,
    per_point: usize,
    eval: E,
    aligned: bool,
    ys: Vec<f64>,
    zs: Vec<f64>,
    scratch: Vec<Mutex<Scratch>>,
}

impl<'g, E: Fn(&Slab, &mut [f64]) + Sync> Evaluator<'g, E> {
    fn new(grid: &'g GridBox, per_point: usize, eval: E) -> Self {
        let ys = (0..grid.counts[1]).map(|j| grid.point(0, j, 0)[1]);
        let zs = (0..grid.counts[2]).map(|k| grid.point(0, 0, k)[2]);
        // One slot per pool thread, plus one for a caller outside the pool.
        let scratch = (0..=rayon::current_num_threads())
            .map(|_| {
                Mutex::new(Scratch {
                    points: Vec::new(),
                    values: Vec::new(),
                })
            })
            .collect();
        Evaluator {
            grid,
            per_point,
            eval,
            aligned: grid.is_axis_aligned(),
            ys: ys.collect(),
            zs: zs.collect(),
            scratch,
        }
    }

    /// Evaluates slab `i` into this thread's scratch (values zeroed first, as a fresh
    /// buffer would be) and passes the values to `then`. The points of an
    /// axis-aligned slab are not listed (see [`Slab`]).
    fn with_slab<R>(&self, i: usize, then: impl FnOnce(&[f64]) -> R) -> R {
        let slot = rayon::current_thread_index()
            .map_or(self.scratch.len() - 1, |t| t.min(self.scratch.len() - 1));
        let mut guard = self.scratch[slot]
            .lock()
            .unwrap_or_else(|poisoned| poisoned.into_inner());
        let Scratch { points, values } = &mut *guard;
        points.clear();
        if !self.aligned {
            self.grid.slab_points(i, points);
        }
        values.clear();
        values.resize(self.ys.len() * self.zs.len() * self.per_point, 0.0);
        let lattice =
            (self.aligned).then(|| (self.grid.point(i, 0, 0)[0], &self.ys[..], &self.zs[..]));
        (self.eval)(&Slab { points, lattice }, values);
        then(values)
    }
}

/// The ordered, bounded pipeline. `produce` fills a batch for a range of slabs on a
/// producer thread (using rayon inside); `consume` takes the batches in order on the
/// calling thread. At most three batches exist (one being produced, one queued, one
/// being consumed); consumed batches are recycled. When `consume` fails the producer
/// stops before its next batch and the error is returned.
fn pipeline<B, M, P, C>(nx: usize, batch: usize, make: M, produce: P, mut consume: C) -> Result<()>
where
    B: Send,
    M: Fn() -> B + Sync,
    P: Fn(Range<usize>, &mut B, &AtomicBool) + Sync,
    C: FnMut(Range<usize>, &mut B) -> Result<()>,
{
    let stop = AtomicBool::new(false);
    std::thread::scope(|s| {
        // Both channels live inside the scope: if `consume` panics they are dropped
        // while unwinding, the producer's send fails and the scope can join it.
        let (full_tx, full_rx) = sync_channel::<(Range<usize>, B)>(1);
        let (empty_tx, empty_rx) = channel::<B>();
        let (stop, make, produce) = (&stop, &make, &produce);
        s.spawn(move || {
            let mut start = 0;
            while start < nx && !stop.load(Ordering::Relaxed) {
                let end = (start + batch).min(nx);
                let mut b = empty_rx.try_recv().unwrap_or_else(|_| make());
                produce(start..end, &mut b, stop);
                if full_tx.send((start..end, b)).is_err() {
                    return;
                }
                start = end;
            }
        });
        let mut result = Ok(());
        for (range, mut b) in full_rx.iter() {
            if let Err(e) = consume(range, &mut b) {
                result = Err(e);
                break;
            }
            // The producer may have finished: then nobody takes the batch back.
            let _ = empty_tx.send(b);
        }
        stop.store(true, Ordering::Relaxed);
        drop(full_rx);
        result
    })
}

/// Evaluates `eval` (points → `per_point` values each) over the whole box, turns each
/// slab's values into a `T` with `post` in parallel, and passes the `T`s to `sink`
/// in slab order, while the next batch is being evaluated.
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
    let ev = Evaluator::new(grid, per_point, eval);
    pipeline(
        grid.counts[0],
        batch_len(),
        Vec::<T>::new,
        |range, b, _| {
            range
                .into_par_iter()
                .map(|i| ev.with_slab(i, &post))
                .collect_into_vec(b);
        },
        |_, b| b.drain(..).try_for_each(&mut sink),
    )
}

/// A batch of fixed-size slots, one per slab, and each slab's post-processing result.
struct Slots<O> {
    data: Vec<O>,
    status: Vec<Result<()>>,
}

/// Like [`stream_slabs`] for results of a fixed size: `post(i, values, slot)` writes
/// slab `i` into its own `slot_len` part of a recycled batch buffer, and `sink(slabs,
/// data)` receives the slots of consecutive slabs as one contiguous slice. When `post`
/// fails for a slab, the slabs before it are still passed to `sink`, then its error
/// is returned (unless `sink` failed first).
pub fn stream_slots<O, E, P, S>(
    grid: &GridBox,
    per_point: usize,
    slot_len: usize,
    eval: E,
    post: P,
    mut sink: S,
) -> Result<()>
where
    O: Copy + Default + Send + Sync,
    E: Fn(&Slab, &mut [f64]) + Sync,
    P: Fn(usize, &[f64], &mut [O]) -> Result<()> + Sync,
    S: FnMut(Range<usize>, &[O]) -> Result<()>,
{
    let ev = Evaluator::new(grid, per_point, eval);
    let batch = batch_len();
    let make = || Slots {
        data: Vec::new(),
        status: Vec::new(),
    };
    let produce = |range: Range<usize>, b: &mut Slots<O>, stop: &AtomicBool| {
        b.data.resize(range.len() * slot_len.max(1), O::default());
        b.status.clear();
        b.status.resize_with(range.len(), || Ok(()));
        let start = range.start;
        b.data
            .par_chunks_mut(slot_len.max(1))
            .zip(b.status.par_iter_mut())
            .enumerate()
            .for_each(|(n, (slot, status))| {
                if !stop.load(Ordering::Relaxed) {
                    let i = start + n;
                    *status = ev.with_slab(i, |values| post(i, values, &mut slot[..slot_len]));
                }
            });
    };
    pipeline(grid.counts[0], batch, make, produce, |range, b| {
        let ok = b.status.iter().take_while(|s| s.is_ok()).count();
        if ok > 0 {
            let end = range.start + ok;
            sink(range.start..end, &b.data[..ok * slot_len])?;
        }
        match b.status.get_mut(ok) {
            Some(failed) => std::mem::replace(failed, Ok(())),
            None => Ok(()),
        }
    })
}

/// All values of the box in memory (tests, small grids), in cube order.
pub fn sample_all<E>(grid: &GridBox, per_point: usize, eval: E) -> Vec<f64>
where
    E: Fn(&Slab, &mut [f64]) + Sync,
{
    let slot = grid.counts[1] * grid.counts[2] * per_point;
    let mut all = Vec::with_capacity(grid.point_count() * per_point);
    stream_slots(
        grid,
        per_point,
        slot,
        eval,
        |_, values, out| {
            out.copy_from_slice(values);
            Ok(())
        },
        |_, v| {
            all.extend_from_slice(v);
            Ok(())
        },
    )
    .expect("an in-memory sink cannot fail");
    all
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::error::Error;
    use std::sync::atomic::AtomicUsize;

    fn grid(nx: usize) -> GridBox {
        GridBox {
            origin: [0.0; 3],
            axes: [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]],
            counts: [nx, 3, 2],
        }
    }

    /// Slabs reach the sink in order, each with its own points (x = slab index).
    #[test]
    fn slabs_arrive_in_order() {
        let mut seen = Vec::new();
        let first_x = |s: &Slab, v: &mut [f64]| v.fill(s.points(&mut Vec::new())[0][0]);
        stream_slabs(
            &grid(50),
            1,
            first_x,
            |v| v[0],
            |x| {
                seen.push(x);
                Ok(())
            },
        )
        .unwrap();
        assert_eq!(seen, (0..50).map(|i| i as f64).collect::<Vec<_>>());
    }

    /// The points an axis-aligned slab builds from its lattice are `GridBox::point`'s
    /// to the bit (evaluators that work from the lattice rely on it), for origins and
    /// spacings of every sign, including a negative zero.
    #[test]
    fn lattice_points_are_the_grid_points() {
        for (origin, h) in [
            (
                [-9.670563, -9.064638, -5.017059],
                [0.048474, 0.048474, 0.048474],
            ),
            ([-0.0, 0.1, -0.0], [0.3, -0.7, 1e-3]),
            ([1e5, -3.3, 0.0], [-0.1, 0.2, 0.15]),
        ] {
            let g = GridBox {
                origin,
                axes: [[h[0], 0.0, 0.0], [0.0, h[1], -0.0], [0.0, 0.0, h[2]]],
                counts: [4, 5, 7],
            };
            let seen = Mutex::new(Vec::new());
            stream_slabs(
                &g,
                1,
                |s: &Slab, _: &mut [f64]| {
                    let pts = s.points(&mut Vec::new()).to_vec();
                    assert_eq!(s.len(), pts.len());
                    seen.lock().unwrap().push(pts);
                },
                |_| (),
                |_| Ok(()),
            )
            .unwrap();
            let mut expected = Vec::new();
            let mut got = seen.into_inner().unwrap();
            got.sort_by(|a, b| a[0][0].total_cmp(&b[0][0]));
            for i in 0..4 {
                let mut p = Vec::new();
                g.slab_points(i, &mut p);
                expected.push(p);
            }
            expected.sort_by(|a, b| a[0][0].total_cmp(&b[0][0]));
            let bits = |v: &Vec<Vec<[f64; 3]>>| -> Vec<u64> {
                v.iter().flatten().flatten().map(|x| x.to_bits()).collect()
            };
            assert_eq!(bits(&got), bits(&expected), "origin {origin:?}");
        }
    }

    /// A failing sink returns its error and the producer stops within the batches
    /// in flight (at most three batches beyond the one that failed).
    #[test]
    fn a_failing_sink_stops_the_producer() {
        let evaluated = AtomicUsize::new(0);
        let count = |_: &Slab, _: &mut [f64]| {
            evaluated.fetch_add(1, Ordering::SeqCst);
        };
        let e = stream_slabs(
            &grid(1000),
            1,
            count,
            |_| (),
            |_| Err(Error::input("sink full")),
        )
        .unwrap_err();
        assert!(e.to_string().contains("sink full"));
        let n = evaluated.load(Ordering::SeqCst);
        assert!(n <= 4 * batch_len(), "{n} slabs evaluated");
    }
}
