//! The marching-tetrahedra case table of the Freudenthal split: for each of the 256
//! inside/outside patterns of a cube's corners, the triangles its six tetrahedra give,
//! wound to face the outside.

use std::sync::LazyLock;

/// The triangles of each of the 256 inside/outside patterns of a cube's corners.
/// Corner c sits at offset (c>>2 & 1, c>>1 & 1, c & 1) in (i, j, k); a triangle
/// vertex is a slot `lo << 3 | d`: the lattice edge from corner lo to corner lo | d.
pub(super) struct Cases {
    pub(super) start: [u16; 257],
    pub(super) tris: Vec<[u8; 3]>,
}

pub(super) static CASES: LazyLock<Cases> = LazyLock::new(build_cases);

fn is_even(p: [usize; 4]) -> bool {
    let inversions = (0..4)
        .flat_map(|a| (a + 1..4).map(move |b| (a, b)))
        .filter(|&(a, b)| p[a] > p[b])
        .count();
    inversions % 2 == 0
}

/// Triangles are wound for a positively oriented tetrahedron (v0..v3), using that
/// (a, a^1, a^2, a^3) is an even permutation for every a, and reversed for the odd
/// tetrahedra of the split (odd permutations of the axes).
fn build_cases() -> Cases {
    const PERMS: [([usize; 3], bool); 6] = [
        ([0, 1, 2], true),
        ([0, 2, 1], false),
        ([1, 0, 2], false),
        ([1, 2, 0], true),
        ([2, 0, 1], true),
        ([2, 1, 0], false),
    ];
    const BIT: [u8; 3] = [4, 2, 1];
    let mut start = [0u16; 257];
    let mut tris = Vec::new();
    for mask in 0..256usize {
        for (p, even) in PERMS {
            let c = [0, BIT[p[0]], BIT[p[0]] | BIT[p[1]], 7];
            let inside = |v: usize| (mask >> c[v]) & 1 == 1;
            // The corners form a chain of bit sets, so the smaller is the base.
            let slot = |a: usize, b: usize| {
                let (lo, hi) = (c[a].min(c[b]), c[a].max(c[b]));
                (lo << 3) | (hi ^ lo)
            };
            let ins: Vec<usize> = (0..4).filter(|&v| inside(v)).collect();
            let outs: Vec<usize> = (0..4).filter(|&v| !inside(v)).collect();
            let mut local: Vec<[u8; 3]> = Vec::new();
            match ins.len() {
                // Wound to face away from the lone inside corner a.
                1 => {
                    let a = ins[0];
                    local.push([slot(a, a ^ 1), slot(a, a ^ 2), slot(a, a ^ 3)]);
                }
                // Wound to face towards the lone outside corner d.
                3 => {
                    let d = outs[0];
                    local.push([slot(d, d ^ 1), slot(d, d ^ 3), slot(d, d ^ 2)]);
                }
                // The quad ac, ad, bd, bc faces the outside pair for even (a,b,c,d).
                2 => {
                    let (a, b) = (ins[0], ins[1]);
                    let (mut c2, mut d2) = (outs[0], outs[1]);
                    if !is_even([a, b, c2, d2]) {
                        std::mem::swap(&mut c2, &mut d2);
                    }
                    let (ac, ad, bd, bc) = (slot(a, c2), slot(a, d2), slot(b, d2), slot(b, c2));
                    local.push([ac, ad, bd]);
                    local.push([ac, bd, bc]);
                }
                _ => {}
            }
            if !even {
                local.iter_mut().for_each(|t| t.swap(1, 2));
            }
            tris.extend(local);
        }
        start[mask + 1] = tris.len() as u16;
    }
    Cases { start, tris }
}
