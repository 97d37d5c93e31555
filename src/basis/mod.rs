//! Atom-centred basis functions, grouped in shells, and the named sets that place
//! them on a molecule. Nothing here solves anything: a `Basis` is plain data that
//! integrals, solvers and grid evaluation read shell by shell.

pub mod gaussian;
pub mod harmonics;
pub mod named;
pub mod sets;
pub mod slater;
pub mod sto_ng;

pub use gaussian::{Angular, GaussianShell};
pub use sets::BasisSpec;
pub use slater::SlaterShell;

/// A group of functions on one centre that share their radial part. An enum, not a
/// trait object, so the grid hot path dispatches without virtual calls.
#[derive(Debug, Clone, PartialEq)]
pub enum Shell {
    Slater(SlaterShell),
    Gaussian(GaussianShell),
}

impl Shell {
    pub fn atom(&self) -> usize {
        match self {
            Shell::Slater(s) => s.atom,
            Shell::Gaussian(g) => g.atom,
        }
    }

    pub fn center(&self) -> [f64; 3] {
        match self {
            Shell::Slater(s) => s.center,
            Shell::Gaussian(g) => g.center,
        }
    }

    pub fn len(&self) -> usize {
        match self {
            Shell::Slater(s) => s.len(),
            Shell::Gaussian(g) => g.len(),
        }
    }

    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// Short label of function `k` of the shell, e.g. "1s(ζ=1.000)", "2px", "d(xy)".
    pub fn label(&self, k: usize) -> String {
        match self {
            Shell::Slater(s) => {
                let h = harmonics::harmonic_name(s.l, s.ms[k]);
                let h = if s.l == 0 {
                    String::from("s")
                } else {
                    h.to_string()
                };
                format!("{}{}(ζ={:.3})", s.n, h, s.zeta)
            }
            Shell::Gaussian(g) => {
                let ang = match g.functions[k] {
                    Angular::Pure(m) => harmonics::harmonic_name(g.l, m).to_string(),
                    Angular::Cartesian(p) | Angular::CartesianShared(p) => {
                        harmonics::cartesian_name(p)
                    }
                };
                let amin = g.exponents.iter().cloned().fold(f64::INFINITY, f64::min);
                match g.exponents.len() {
                    1 => format!("{ang}(α={amin:.4})"),
                    n => format!("{ang}({n}G, α≥{amin:.4})"),
                }
            }
        }
    }

    /// Values of the shell's functions at points (functions × points).
    pub fn values(&self, points: &[[f64; 3]], out: &mut [f64]) {
        match self {
            Shell::Slater(s) => s.values(points, out),
            Shell::Gaussian(g) => g.values(points, out),
        }
    }

    /// Exact gradients ∇φ of the shell's functions at points (functions × points, like
    /// `values`), for isosurface normals that agree with the exactly placed vertices.
    pub fn gradients(&self, points: &[[f64; 3]], out: &mut [[f64; 3]]) {
        match self {
            Shell::Slater(s) => s.gradients(points, out),
            Shell::Gaussian(g) => g.gradients(points, out),
        }
    }
}

#[derive(Debug, Clone, PartialEq)]
pub struct Basis {
    /// The set's name as the user gave it, e.g. "sto-3g".
    pub name: String,
    pub shells: Vec<Shell>,
}

/// What kind of set a basis is, read once from its name where it was built; every
/// caution about the basis follows from this one rule.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum BasisKind {
    /// One 1s Slater function per atom.
    Slater1s,
    /// A named STO-nG set (sto-3g, sto-6g).
    StoNg,
    /// The valence Slater set of extended Hückel.
    Valence,
    /// Even-tempered or the user's own shells.
    Extended,
    /// Functions read from an orbital file.
    FromFile,
}

impl BasisKind {
    /// One function per occupied atomic shell: energies are upper bounds far from
    /// the basis limit, and bonds come out too weak.
    pub fn is_minimal(self) -> bool {
        matches!(
            self,
            BasisKind::Slater1s | BasisKind::StoNg | BasisKind::Valence
        )
    }
}

impl Basis {
    /// The kind of set, from the name its builder gave it.
    pub fn kind(&self) -> BasisKind {
        match self.name.as_str() {
            "slater-1s" => BasisKind::Slater1s,
            n if n.starts_with("sto-") => BasisKind::StoNg,
            "extended-huckel valence" => BasisKind::Valence,
            "orbital file" => BasisKind::FromFile,
            _ => BasisKind::Extended,
        }
    }

    /// Number of basis functions.
    pub fn len(&self) -> usize {
        self.shells.iter().map(Shell::len).sum()
    }

    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// Index of the first function of each shell.
    pub fn offsets(&self) -> Vec<usize> {
        let mut at = 0;
        self.shells
            .iter()
            .map(|s| {
                let o = at;
                at += s.len();
                o
            })
            .collect()
    }

    /// (atom, label) of every function, in basis order.
    pub fn function_labels(&self) -> Vec<(usize, String)> {
        self.shells
            .iter()
            .flat_map(|s| (0..s.len()).map(move |k| (s.atom(), s.label(k))))
            .collect()
    }

    /// Per function, the factor s with φ = s · (the same function normalised to 1):
    /// 1 except for shared-scale Cartesian components (see `Angular`). A coefficient
    /// c on φ is c·s on the normalised function.
    pub fn function_factors(&self) -> Vec<f64> {
        self.shells
            .iter()
            .flat_map(|s| -> Vec<f64> {
                match s {
                    Shell::Gaussian(g) => g.functions.iter().map(|f| f.own_norm_factor()).collect(),
                    Shell::Slater(s) => vec![1.0; s.ms.len()],
                }
            })
            .collect()
    }

    /// Whether every shell is Gaussian (analytic integrals exist for any geometry).
    pub fn all_gaussian(&self) -> bool {
        self.shells.iter().all(|s| matches!(s, Shell::Gaussian(_)))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Step of the central differences. Their truncation error is h²/6 |φ‴| ≈ 2e-11
    /// |φ‴| and their rounding error about ε |φ| / h ≈ 2e-11 |φ| (ε = 2.2e-16): for
    /// exponents up to ~4 bohr⁻² both stay near 1e-9 of the largest gradient, so 1e-7
    /// is a margin of ~100 that still catches any wrong term (textbook error analysis).
    const H: f64 = 1e-5;
    const TOL: f64 = 1e-7;

    /// Points 0.3 to 3.4 bohr from `c` in a spiral of directions, plus points on the
    /// axes and in the coordinate planes (zero components exercise the power rules).
    fn points_around(c: [f64; 3]) -> Vec<[f64; 3]> {
        let mut pts: Vec<[f64; 3]> = (0..40)
            .map(|i| {
                let t = i as f64 + 0.5;
                let z = 1.0 - 2.0 * t / 40.0;
                let s = (1.0 - z * z).sqrt();
                let a = 2.399_963 * t;
                let r = 0.3 + 0.08 * i as f64;
                [c[0] + r * s * a.cos(), c[1] + r * s * a.sin(), c[2] + r * z]
            })
            .collect();
        for v in [
            [0.9, 0.0, 0.0],
            [0.0, -1.1, 0.0],
            [0.0, 0.0, 0.7],
            [0.6, 0.8, 0.0],
            [0.0, 0.5, -1.2],
        ] {
            pts.push([c[0] + v[0], c[1] + v[1], c[2] + v[2]]);
        }
        pts
    }

    /// Largest deviation of `gradients` from central differences of `values`,
    /// relative to the largest gradient component of the same function.
    fn worst_relative_error(shell: &Shell, pts: &[[f64; 3]]) -> f64 {
        let (nfun, n) = (shell.len(), pts.len());
        let mut grad = vec![[0.0; 3]; nfun * n];
        shell.gradients(pts, &mut grad);
        let mut fd = vec![[0.0; 3]; nfun * n];
        let (mut plus, mut minus) = (vec![0.0; nfun * n], vec![0.0; nfun * n]);
        for i in 0..3 {
            let shifted = |s: f64| -> Vec<[f64; 3]> {
                pts.iter()
                    .map(|p| {
                        let mut q = *p;
                        q[i] += s;
                        q
                    })
                    .collect()
            };
            shell.values(&shifted(H), &mut plus);
            shell.values(&shifted(-H), &mut minus);
            for (k, g) in fd.iter_mut().enumerate() {
                g[i] = (plus[k] - minus[k]) / (2.0 * H);
            }
        }
        let mut worst = 0.0f64;
        for f in 0..nfun {
            let block = f * n..(f + 1) * n;
            let scale = grad[block.clone()]
                .iter()
                .flatten()
                .fold(0.0f64, |m, v| m.max(v.abs()));
            assert!(scale > 0.0, "{}: zero gradient everywhere", shell.label(f));
            for (a, b) in grad[block.clone()].iter().zip(&fd[block]) {
                for i in 0..3 {
                    assert!(a[i].is_finite(), "{}: {a:?}", shell.label(f));
                    worst = worst.max((a[i] - b[i]).abs() / scale);
                }
            }
        }
        worst
    }

    #[test]
    fn gaussian_gradients_match_central_differences() {
        let c = [0.3, -0.2, 0.5];
        let pts = points_around(c);
        // A tight and a diffuse primitive, so the radial sum has two scales.
        let prims = vec![(4.0, 0.3), (0.6, 0.7)];
        let mut worst = 0.0f64;
        for l in 0..=3 {
            for pure in [false, true] {
                let shell =
                    Shell::Gaussian(GaussianShell::full(0, c, l, prims.clone(), pure).unwrap());
                let e = worst_relative_error(&shell, &pts);
                assert!(e < TOL, "l = {l}, pure = {pure}: relative error {e:e}");
                worst = worst.max(e);
            }
        }
        eprintln!("Gaussian s–f, Cartesian and pure: worst relative error {worst:.2e}");
    }

    #[test]
    fn slater_gradients_match_central_differences() {
        let c = [-0.4, 0.1, 0.2];
        let pts = points_around(c);
        let mut worst = 0.0f64;
        for (n, l, zeta) in [
            (1, 0, 1.3),
            (2, 0, 1.1),
            (2, 1, 1.6),
            (3, 2, 1.2),
            (4, 3, 1.0),
        ] {
            let ms = (-(l as i32)..=l as i32).collect();
            let shell = Shell::Slater(SlaterShell::new(0, c, n, l, zeta, ms).unwrap());
            let e = worst_relative_error(&shell, &pts);
            assert!(e < TOL, "n = {n}, l = {l}: relative error {e:e}");
            worst = worst.max(e);
        }
        eprintln!("Slater 1s, 2s, 2p, 3d, 4f: worst relative error {worst:.2e}");
    }

    /// At the centre every gradient is finite; a 2p function e^(−ζr) x has slope
    /// N √(3/4π) along its axis there (the limit of the derivative, by hand).
    #[test]
    fn gradients_at_the_centre_are_finite() {
        let c = [0.0, 0.0, 0.0];
        let shells = [
            Shell::Slater(SlaterShell::s1(0, c, 1.0).unwrap()),
            Shell::Slater(SlaterShell::new(0, c, 2, 0, 1.0, vec![0]).unwrap()),
            Shell::Slater(SlaterShell::new(0, c, 2, 1, 1.5, vec![-1, 0, 1]).unwrap()),
            Shell::Slater(SlaterShell::new(0, c, 3, 2, 1.0, vec![-2, 0, 2]).unwrap()),
            Shell::Gaussian(GaussianShell::full(0, c, 1, vec![(1.0, 1.0)], true).unwrap()),
            Shell::Gaussian(GaussianShell::full(0, c, 3, vec![(1.0, 1.0)], false).unwrap()),
        ];
        for s in &shells {
            let mut g = vec![[f64::NAN; 3]; s.len()];
            s.gradients(&[c], &mut g);
            assert!(g.iter().flatten().all(|v| v.is_finite()), "{g:?}");
        }
        let mut g = vec![[0.0; 3]; 3];
        shells[2].gradients(&[c], &mut g);
        let zeta: f64 = 1.5;
        let norm = (2.0 * zeta).powf(2.5) / 24f64.sqrt();
        let slope = norm * (3.0 / (4.0 * std::f64::consts::PI)).sqrt();
        // m = +1 is x (DESIGN conventions).
        assert!((g[2][0] - slope).abs() < 1e-14 * slope, "{:?}", g[2]);
        assert_eq!([g[2][1], g[2][2]], [0.0, 0.0]);
    }
}
