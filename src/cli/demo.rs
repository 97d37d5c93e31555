//! `lobecast demo`: the built-in gallery. Each step is an ordinary lobecast command,
//! run as a child process of this same binary, so that every file comes with the
//! exact command that makes it on its own (listed in GALLERY.md).

use std::path::PathBuf;
use std::process::Command;
use std::time::Instant;

use clap::Args;

use super::common::say;
use lobecast::error::{Error, Result};
use lobecast::output::write_bytes;

/// The scenario's built-in model: the one-electron hydrogen molecular ion.
const H2_CATION: &str = include_str!("../../examples/h2-cation.toml");
/// The small π-bonded molecule of part 2 (geometry and its source in the file).
const ETHYLENE: &str = include_str!("../../examples/ethylene.xyz");
/// The molecule of the frontier-orbital picture.
const WATER: &str = include_str!("../../examples/water.xyz");

#[derive(Debug, Args)]
pub struct DemoArgs {
    /// Folder for the gallery (created if missing)
    #[arg(long, default_value = "outputs")]
    pub out: PathBuf,
    /// A reduced, faster gallery (coarser scans and grids, smaller figures)
    #[arg(long)]
    pub quick: bool,
}

/// One step: what it is, the files it writes with captions, and its arguments.
struct Step {
    title: &'static str,
    files: Vec<(String, String)>,
    args: Vec<String>,
}

fn step(title: &'static str, files: &[(&str, &str)], args: &str) -> Step {
    Step {
        title,
        files: files
            .iter()
            .map(|(f, c)| (f.to_string(), c.to_string()))
            .collect(),
        args: args.split_whitespace().map(String::from).collect(),
    }
}

/// The model at separation `r` (bohr), written into the gallery's models folder:
/// the example model read as TOML data, its two nuclei placed at z = ∓r/2.
fn h2_model(r: f64) -> Result<String> {
    let bad = |why: String| Error::internal(format!("the built-in ion model: {why}"));
    let mut doc: toml::Table = H2_CATION.parse().map_err(|e| bad(format!("{e}")))?;
    let atoms = doc
        .get_mut("molecule")
        .and_then(|m| m.get_mut("atoms"))
        .and_then(|a| a.as_array_mut())
        .filter(|a| a.len() == 2)
        .ok_or_else(|| bad("no [molecule] atoms pair".into()))?;
    for (atom, z) in atoms.iter_mut().zip([-0.5 * r, 0.5 * r]) {
        let atom = atom
            .as_table_mut()
            .ok_or_else(|| bad("an atom is not a table".into()))?;
        atom.insert("position".into(), vec![0.0, 0.0, z].into());
    }
    let text = toml::to_string(&doc).map_err(|e| bad(format!("{e}")))?;
    Ok(format!(
        "# The one-electron ion of the demo at R = {r} bohr (written by lobecast demo)\n{text}"
    ))
}

fn steps(quick: bool) -> Vec<Step> {
    let (dr, size, h, w3) = if quick {
        ("0.25", "500", "0.3", "800")
    } else {
        ("0.05", "1000", "0.15", "1500")
    };
    let mut s = vec![
        step(
            "energy curve and build-up, ζ = 1",
            &[
                (
                    "h2plus-curve.csv",
                    "S, J, K, E₊, E₋ and the build-up columns against R (ζ = 1)",
                ),
                (
                    "h2plus-curve.json",
                    "the same curve with its refined equilibrium and binding energy",
                ),
                (
                    "h2plus-curve.png",
                    "bonding and antibonding energies against R, equilibrium marked, hartree and eV",
                ),
                (
                    "h2plus-curve-integrals.png",
                    "overlap S, Coulomb J and exchange K against R",
                ),
                (
                    "h2plus-curve-buildup.png",
                    "electrons gained between the nuclei by the bonding orbital and lost by the antibonding one, against R",
                ),
            ],
            &format!(
                "curve models/h2plus-r2.5.toml --units bohr --from 0.6 --to 8 --step {dr} --buildup --csv h2plus-curve.csv --json h2plus-curve.json --png h2plus-curve.png"
            ),
        ),
        step(
            "energy curve, optimised ζ",
            &[
                (
                    "h2plus-curve-zeta.csv",
                    "the curve with the 1s exponent optimised at every R (zeta column)",
                ),
                (
                    "h2plus-curve-zeta.png",
                    "energies with optimised ζ: a deeper well at a shorter bond",
                ),
                (
                    "h2plus-curve-zeta-integrals.png",
                    "S, J and K with optimised ζ",
                ),
            ],
            &format!(
                "curve models/h2plus-r2.5.toml --units bohr --from 0.6 --to 8 --step {dr} --optimize-zeta --csv h2plus-curve-zeta.csv --png h2plus-curve-zeta.png"
            ),
        ),
    ];
    for (r, name, what) in [
        ("1.2", "r1.2", "compressed"),
        ("2.5", "r2.5", "near the equilibrium"),
        ("5.0", "r5.0", "stretched"),
    ] {
        s.push(Step {
            title: "orbital slices",
            files: vec![(format!("h2plus-{name}-orbitals.png"), format!("bonding and antibonding orbitals at R = {r} bohr ({what}), one colour scale"))],
            args: format!("slice models/h2plus-{name}.toml --panels orbital:1,orbital:2 --shared-scale --plane xz --zero-contour --size {size} --png h2plus-{name}-orbitals.png")
                .split_whitespace()
                .map(String::from)
                .collect(),
        });
        s.push(Step {
            title: "deformation panels",
            files: vec![(format!("h2plus-{name}-deformation.png"), format!("orbital deformation densities of both orbitals at R = {r} bohr ({what}), one colour scale"))],
            args: format!("slice models/h2plus-{name}.toml --panels orbital-deformation:1,orbital-deformation:2 --shared-scale --plane xz --extent 3 --size {size} --png h2plus-{name}-deformation.png")
                .split_whitespace()
                .map(String::from)
                .collect(),
        });
    }
    let eht = "models/ethylene.xyz --method extended-huckel";
    s.push(step(
        "ethylene π orbitals across the C=C bond",
        &[("ethylene-frontier-xz.png", "ethylene HOMO (π) and LUMO (π*) in the plane through the C=C bond perpendicular to the molecule: one nodal plane, two for π*")],
        &format!("slice {eht} --panels orbital:homo,orbital:lumo --shared-scale --plane xz --zero-contour --size {size} --png ethylene-frontier-xz.png"),
    ));
    s.push(step(
        "ethylene π orbitals above the molecular plane",
        &[("ethylene-frontier-above.png", "HOMO and LUMO 0.5 Å above the molecular plane (in the plane itself both vanish)")],
        &format!("slice {eht} --panels orbital:homo,orbital:lumo --shared-scale --plane xy@0.5 --zero-contour --size {size} --png ethylene-frontier-above.png"),
    ));
    s.push(step(
        "ethylene deformation density",
        &[("ethylene-deformation.png", "valence density minus spherical free atoms in the molecular plane: density gathered in the C–C and C–H bonds")],
        &format!("slice {eht} --field deformation --plane xy --size {size} --png ethylene-deformation.png"),
    ));
    s.push(step(
        "3-D orbitals near the equilibrium",
        &[
            ("h2plus-r2.5-3d.png", "bonding and antibonding orbitals at R = 2.5 bohr as 3-D surfaces enclosing 90 % of ∫ψ² dV: one lobe around both nuclei, two lobes split by the nodal plane; translucent, so the nuclei show"),
            ("h2plus-r2.5-orbitals.glb", "the same surfaces as a glTF 2.0 mesh with the molecule, for any 3-D tool (bohr)"),
        ],
        &format!("surface models/h2plus-r2.5.toml --panels orbital:1,orbital:2 --view +y --opacity 0.6 --spacing {h} --units bohr --size {w3} --png h2plus-r2.5-3d.png --mesh h2plus-r2.5-orbitals.glb --mesh-molecule"),
    ));
    s.push(step(
        "ethylene π and π* in 3-D",
        &[("ethylene-pi-3d.png", "ethylene HOMO (π) and LUMO (π*) as 3-D surfaces: two lobes above and below the plane, and the extra nodal plane of π*")],
        &format!("surface {eht} --panels orbital:homo,orbital:lumo --spacing {h} --units bohr --size {w3} --png ethylene-pi-3d.png"),
    ));
    s.push(step(
        "water frontier orbitals in 3-D",
        &[("water-frontier-3d.png", "water HOMO−1, HOMO (the out-of-plane lone pair) and LUMO by extended Hückel, one camera")],
        &format!("surface models/water.xyz --method extended-huckel --panels orbital:homo-1,orbital:homo,orbital:lumo --opacity 0.8 --spacing {h} --units bohr --size {w3} --png water-frontier-3d.png"),
    ));
    s.push(step(
        "level diagram of the ion from two atoms",
        &[
            ("h2plus-r2.5-levels.png", "the bonding level below the H 1s level and the antibonding one above, each joined to both atoms with weight ½, with both orbitals in 3-D beside their levels"),
            ("h2plus-r2.5-weights.csv", "every molecular level, fragment level and weight behind the diagram"),
        ],
        "levels models/h2plus-r2.5.toml --fragments 1:2 --thumbnails 1,2 --png h2plus-r2.5-levels.png --csv h2plus-r2.5-weights.csv",
    ));
    s.push(step(
        "ethylene levels from two CH₂ groups",
        &[("ethylene-levels.png", "ethylene's levels between those of its two CH₂ groups by extended Hückel: π and π* built only from the groups' out-of-plane p orbitals; HOMO and LUMO in 3-D")],
        &format!("levels {eht} --fragments 1,5,6:2-4 --thumbnails homo,lumo --png ethylene-levels.png"),
    ));
    s.push(step(
        "ethylene cube volumes",
        &[("ethylene.cube", "ethylene HOMO, LUMO, valence density and deformation density for a 3-D viewer (bohr)")],
        &format!("volume {eht} --field orbital:homo --field orbital:lumo --field density --field deformation --spacing {h} --units bohr --out ethylene.cube"),
    ));
    s.push(step(
        "cube volumes near the equilibrium",
        &[("h2plus-r2.5.cube", "orbitals 1 and 2 and their deformation densities at R = 2.5 bohr, for a 3-D viewer (bohr)")],
        &format!("volume models/h2plus-r2.5.toml --field orbital:1 --field orbital:2 --field orbital-deformation:1 --field orbital-deformation:2 --spacing {h} --units bohr --out h2plus-r2.5.cube"),
    ));
    s
}

pub fn run(args: DemoArgs) -> Result<()> {
    let started = Instant::now();
    let out = &args.out;
    std::fs::create_dir_all(out.join("models"))
        .map_err(|e| Error::input(format!("cannot create the folder {}: {e}", out.display())))?;
    write_bytes(&out.join("models/ethylene.xyz"), &[], ETHYLENE.as_bytes())?;
    write_bytes(&out.join("models/water.xyz"), &[], WATER.as_bytes())?;
    for r in [1.2, 2.5, 5.0] {
        write_bytes(
            &out.join(format!("models/h2plus-r{r:.1}.toml")),
            &[],
            h2_model(r)?.as_bytes(),
        )?;
    }
    let exe = std::env::current_exe()
        .map_err(|e| Error::internal(format!("cannot find the lobecast binary: {e}")))?;
    let steps = steps(args.quick);
    say!(
        "lobecast demo: a gallery for the Larkspur Hill teaching lab's report on chemical bonding, in {}{}",
        out.display(),
        if args.quick { " (quick)" } else { "" }
    );
    let mut cube_seconds = 0.0;
    for (i, s) in steps.iter().enumerate() {
        let t = Instant::now();
        let result = Command::new(&exe).args(&s.args).current_dir(out).output();
        let seconds = t.elapsed().as_secs_f64();
        let output =
            result.map_err(|e| Error::internal(format!("cannot run step {}: {e}", i + 1)))?;
        if !output.status.success() {
            let err = String::from_utf8_lossy(&output.stderr);
            return Err(Error::internal(format!(
                "step {} ({}) failed: {}",
                i + 1,
                s.title,
                err.trim()
            )));
        }
        if s.args[0] == "volume" {
            cube_seconds += seconds;
        }
        let names: Vec<&str> = s.files.iter().map(|(f, _)| f.as_str()).collect();
        say!(
            "[{:>2}/{}] {seconds:6.2} s  {}: {}",
            i + 1,
            steps.len(),
            s.title,
            names.join(", ")
        );
    }
    write_bytes(&out.join("GALLERY.md"), &[], gallery(&steps).as_bytes())?;
    let total = started.elapsed().as_secs_f64();
    say!(
        "wrote {} files and GALLERY.md in {total:.1} s ({:.0} % of it writing cube files); open GALLERY.md for what each shows",
        steps.iter().map(|s| s.files.len()).sum::<usize>(),
        100.0 * cube_seconds / total
    );
    Ok(())
}

fn gallery(steps: &[Step]) -> String {
    let mut g = String::from(
        "# Gallery\n\n\
         Made by `lobecast demo` for the Larkspur Hill teaching lab's report on bonding in the one-electron \
         hydrogen molecular ion: how a single electron shared by two protons piles up between them in the \
         bonding orbital and is pushed out by a nodal plane in the antibonding one, and how that changes with \
         the separation R. Run each command from this folder to make its file on its own.\n\n\
         The second part applies the same questions to ethylene, a small π-bonded molecule, with extended \
         Hückel orbitals.\n\n\
         Both are qualitative models. The ion's minimal basis (one 1s Slater function per nucleus) gives \
         pictures that are right in shape, but energies that are variational upper bounds and a bond that is \
         too weak; extended Hückel is semi-empirical. Use the numbers for trends, not as quantitative results.\n\n\
         | file | what it shows | command |\n| --- | --- | --- |\n",
    );
    for s in steps {
        for (f, caption) in &s.files {
            g += &format!("| `{f}` | {caption} | `lobecast {}` |\n", s.args.join(" "));
        }
    }
    g
}
