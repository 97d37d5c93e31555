//! Per-thread working memory of the tiled evaluation: allocated on a thread's first
//! tile and reused by every later call on that thread (the sampler's workers call
//! once per slab), so the hot path neither allocates nor zeroes whole slabs.

use std::cell::RefCell;

/// Buffers above this many bytes in total are released after the call that grew
/// them, so one huge request does not pin memory on a pool thread for good.
const KEEP_BYTES: usize = 32 << 20;

#[derive(Default)]
pub(super) struct Scratch {
    /// Basis values of one tile, functions × `TILE`.
    pub phi: Vec<f64>,
    /// Orbital values of one tile, orbitals × `TILE`.
    pub psi: Vec<f64>,
    /// Per-group work of one tile: offsets to the centre, and r or r² per point.
    pub d: Vec<[f64; 3]>,
    pub r: Vec<f64>,
    /// Exponentials of one group (primitives × `TILE`).
    pub ex: Vec<f64>,
    /// Whether each function's values on the tile may be nonzero.
    pub live: Vec<bool>,
    /// One field's values on a tile (densities accumulate here).
    pub acc: Vec<f64>,
    /// The live functions of a tile, in increasing order.
    pub active: Vec<u32>,
    /// Terms of one line segment on the fused path (`lattice::fused`).
    pub terms: super::lattice::Terms,
    /// Separable per-slab tables of the lattice path (see `lattice`).
    pub lattice: super::lattice::Tables,
}

impl Scratch {
    fn bytes(&self) -> usize {
        8 * (self.phi.capacity()
            + self.psi.capacity()
            + 3 * self.d.capacity()
            + self.r.capacity()
            + self.ex.capacity()
            + self.acc.capacity())
            + self.live.capacity()
            + 4 * self.active.capacity()
            + self.lattice.bytes()
            + self.terms.bytes()
    }
}

/// Grows `v` to at least `n` elements (new ones zero) without shrinking it.
pub(super) fn at_least<T: Clone + Default>(v: &mut Vec<T>, n: usize) {
    if v.len() < n {
        v.resize(n, T::default());
    }
}

thread_local! {
    static POOL: RefCell<Scratch> = RefCell::new(Scratch::default());
}

/// Runs `f` with this thread's scratch (a fresh one if it is already in use, which
/// only a re-entrant call could cause).
pub(super) fn with_scratch<R>(f: impl FnOnce(&mut Scratch) -> R) -> R {
    POOL.with(|cell| match cell.try_borrow_mut() {
        Ok(mut s) => {
            let out = f(&mut s);
            if s.bytes() > KEEP_BYTES {
                *s = Scratch::default();
            }
            out
        }
        Err(_) => f(&mut Scratch::default()),
    })
}
