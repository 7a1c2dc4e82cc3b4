use std::path::{Path, PathBuf};
use std::process::Command;

/// The crate root.
pub fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

/// ../shared beside the checkout (FLOWZONE_SHARED overrides).
pub fn shared() -> PathBuf {
    match std::env::var_os("FLOWZONE_SHARED") {
        Some(p) => PathBuf::from(p),
        None => root().join("..").join("shared"),
    }
}

/// Every `.las` file under `dir` and its subfolders (any case of the
/// extension), sorted.
pub fn las_files_under(dir: &Path) -> Vec<PathBuf> {
    let mut out = Vec::new();
    let mut stack = vec![dir.to_path_buf()];
    while let Some(d) = stack.pop() {
        let entries =
            std::fs::read_dir(&d).unwrap_or_else(|e| panic!("{} must exist: {e}", d.display()));
        for e in entries.flatten() {
            let p = e.path();
            if p.is_dir() {
                stack.push(p);
            } else if p.extension().is_some_and(|x| x.eq_ignore_ascii_case("las")) {
                out.push(p);
            }
        }
    }
    out.sort();
    out
}

/// A real sample file committed in tests/data/real (provenance there).
pub fn real(name: &str) -> PathBuf {
    root().join("tests/data/real").join(name)
}

/// The Python that has lasio: FLOWZONE_PYTHON, else the project's .venv.
/// The tests that need it are `#[ignore = "needs lasio ..."]`, so a plain
/// `cargo test` reports them as not run; run with `--include-ignored` (as
/// `.ci/run` does, after installing it) they fail, never skip, without it.
pub fn python() -> PathBuf {
    let p = match std::env::var_os("FLOWZONE_PYTHON") {
        Some(p) => PathBuf::from(p),
        None => root().join(".venv").join("bin").join("python"),
    };
    assert!(
        p.exists(),
        "no Python with lasio at {}: run `bash .ci/run`, or `python3 -m venv .venv && .venv/bin/pip install lasio`",
        p.display()
    );
    p
}

/// Run the lasio oracle: `dump FILE` → JSON, or an Err with lasio's last error line.
pub fn lasio_dump(file: &Path) -> Result<serde_json::Value, String> {
    let out = Command::new(python())
        .arg(root().join("tests/py/lasio_oracle.py"))
        .arg("dump")
        .arg(file)
        .output()
        .expect("python runs");
    if !out.status.success() {
        let err = String::from_utf8_lossy(&out.stderr);
        return Err(err.lines().last().unwrap_or("").to_string());
    }
    Ok(serde_json::from_slice(&out.stdout).expect("oracle prints JSON"))
}

/// Write a LAS file with lasio from a JSON spec.
pub fn lasio_write(spec: &serde_json::Value, out: &Path) {
    let spec_path = out.with_extension("json");
    std::fs::write(&spec_path, serde_json::to_vec(spec).expect("json")).expect("write spec");
    let status = Command::new(python())
        .arg(root().join("tests/py/lasio_oracle.py"))
        .arg("write")
        .arg(&spec_path)
        .arg(out)
        .status()
        .expect("python runs");
    assert!(status.success(), "lasio failed to write {}", out.display());
}

/// The values of a lasio curve, null as NaN.
pub fn json_values(curve: &serde_json::Value) -> Vec<f64> {
    curve["data"]
        .as_array()
        .expect("data array")
        .iter()
        .map(|v| v.as_f64().unwrap_or(f64::NAN))
        .collect()
}

/// Same length, NaN in the same places, values within `rel` relative tolerance.
#[track_caller]
pub fn assert_same_values(context: &str, ours: &[f64], theirs: &[f64], rel: f64) {
    assert_eq!(
        ours.len(),
        theirs.len(),
        "{context}: {} rows vs {}",
        ours.len(),
        theirs.len()
    );
    for (i, (a, b)) in ours.iter().zip(theirs).enumerate() {
        if a.is_nan() || b.is_nan() {
            assert!(
                a.is_nan() && b.is_nan(),
                "{context}: row {i}: ours {a}, theirs {b}"
            );
        } else {
            assert!(
                (a - b).abs() <= rel * a.abs().max(b.abs()).max(1e-12),
                "{context}: row {i}: ours {a}, theirs {b}"
            );
        }
    }
}

/// The flowzone binary built for these tests.
pub fn flowzone() -> Command {
    Command::new(env!("CARGO_BIN_EXE_flowzone"))
}

/// The error text with its cause chain, as the CLI prints it.
pub fn chain(e: &dyn std::error::Error) -> String {
    flowzone::error::chain(e)
}

/// Run the README's main job (`run --config config/demo-field.toml`) into `out`;
/// it must succeed. Returns run-summary.json.
pub fn run_demo_field(out: &Path) -> serde_json::Value {
    run_summary(&root().join("config/demo-field.toml"), out)
}

/// `flowzone run --quiet [extra...] --config CFG --out OUT`.
pub fn run_config(cfg: &Path, out: &Path, extra: &[&str]) -> std::process::Output {
    flowzone()
        .args(["run", "--quiet"])
        .args(extra)
        .arg("--config")
        .arg(cfg)
        .arg("--out")
        .arg(out)
        .output()
        .expect("runs")
}

/// The same bytes with CRLF line endings.
pub fn crlf(bytes: &[u8]) -> Vec<u8> {
    let mut out = Vec::with_capacity(bytes.len() + bytes.len() / 20);
    for &b in bytes {
        if b == b'\n' {
            out.push(b'\r');
        }
        out.push(b);
    }
    out
}

/// Header and rows of a CSV file (plain comma-separated, no quoting).
pub fn read_table(path: &Path) -> (Vec<String>, Vec<Vec<String>>) {
    let mut r = csv::Reader::from_path(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    let head = r
        .headers()
        .unwrap_or_else(|e| panic!("{}: {e}", path.display()))
        .iter()
        .map(String::from)
        .collect();
    let rows = r
        .records()
        .map(|rec| {
            rec.unwrap_or_else(|e| panic!("{}: {e}", path.display()))
                .iter()
                .map(String::from)
                .collect()
        })
        .collect();
    (head, rows)
}

/// The index of a column by name; panics naming the columns there are.
pub fn col(head: &[String], name: &str) -> usize {
    head.iter()
        .position(|h| h == name)
        .unwrap_or_else(|| panic!("no column {name} in {head:?}"))
}

/// The demo config with its paths made absolute, passed through `edit`,
/// written into `dir` as field.toml.
pub fn demo_config_edited(dir: &Path, edit: impl Fn(String) -> String) -> PathBuf {
    let text = std::fs::read_to_string(root().join("config/demo-field.toml")).expect("config");
    let abs = root().join("demo-wells");
    let text = text.replace("\"../demo-wells", &format!("\"{}", abs.display()));
    let path = dir.join("field.toml");
    std::fs::write(&path, edit(text)).expect("write config");
    path
}

/// `run` with `cfg` into `out`, which must succeed; returns run-summary.json.
pub fn run_summary(cfg: &Path, out: &Path) -> serde_json::Value {
    let run = run_config(cfg, out, &[]);
    assert!(
        run.status.success(),
        "{}",
        String::from_utf8_lossy(&run.stderr)
    );
    serde_json::from_slice(&std::fs::read(out.join("run-summary.json")).expect("summary"))
        .expect("json")
}

/// Two folders' files (as [`files`] reads them) are the same, byte for byte.
#[track_caller]
pub fn assert_same(
    expected: &std::collections::BTreeMap<PathBuf, Vec<u8>>,
    got: &std::collections::BTreeMap<PathBuf, Vec<u8>>,
    what: &str,
) {
    assert_eq!(
        expected.keys().collect::<Vec<_>>(),
        got.keys().collect::<Vec<_>>(),
        "{what}: the same files"
    );
    for (k, v) in expected {
        assert!(got[k] == *v, "{} differs ({what})", k.display());
    }
}

/// Every file under `dir` (relative path → bytes), except hidden ones
/// (temporary files) and run-manifest.json, whose times change from run
/// to run.
pub fn files(dir: &Path) -> std::collections::BTreeMap<PathBuf, Vec<u8>> {
    let mut out = std::collections::BTreeMap::new();
    let mut stack = vec![dir.to_path_buf()];
    while let Some(d) = stack.pop() {
        for e in std::fs::read_dir(&d).expect("read dir") {
            let p = e.expect("entry").path();
            let name = p
                .file_name()
                .map(|n| n.to_string_lossy().into_owned())
                .unwrap_or_default();
            if p.is_dir() {
                stack.push(p);
            } else if !name.starts_with('.') && name != "run-manifest.json" {
                let rel = p.strip_prefix(dir).expect("under dir").to_path_buf();
                out.insert(rel, std::fs::read(&p).expect("read"));
            }
        }
    }
    out
}

/// `flowzone demo --wells N --depths M --out DIR`, which must succeed: a
/// synthetic bench field (LAS files, tables, field.toml, field-full.toml).
pub fn bench_field(dir: &Path, wells: usize, depths: usize) {
    let made = flowzone()
        .args([
            "demo",
            "--wells",
            &wells.to_string(),
            "--depths",
            &depths.to_string(),
            "--out",
        ])
        .arg(dir)
        .output()
        .expect("runs");
    assert!(
        made.status.success(),
        "{}",
        String::from_utf8_lossy(&made.stderr)
    );
}

/// A CSV cell as a number, NaN when empty or not a number.
pub fn num(s: &str) -> f64 {
    s.parse().unwrap_or(f64::NAN)
}
