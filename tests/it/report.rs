//! The HTML report in a real browser: Debian's chromium, headless (installed
//! by .ci/run; FLOWZONE_CHROMIUM names another binary). Each page loads with
//! no console message (the pages have no scripts, so any message is a
//! fault), every plot is in the rendered DOM, every relative link resolves,
//! and a screenshot of the field page is kept in target/test-artefacts/.

use std::path::{Path, PathBuf};
use std::process::Command;

use crate::common::{demo_config_edited, root, run_summary};

fn chromium() -> PathBuf {
    if let Some(p) = std::env::var_os("FLOWZONE_CHROMIUM") {
        return PathBuf::from(p);
    }
    for name in ["chromium", "chromium-browser"] {
        for dir in std::env::split_paths(&std::env::var_os("PATH").unwrap_or_default()) {
            let p = dir.join(name);
            if p.is_file() {
                return p;
            }
        }
    }
    panic!(
        "no chromium on PATH: `bash .ci/run` installs Debian's chromium (apt-get install chromium)"
    );
}

/// (rendered DOM, browser log) of a page.
fn render(page: &Path, extra: &[&str]) -> (String, String) {
    let profile = tempfile::tempdir().expect("profile dir");
    let out = Command::new(chromium())
        .args([
            "--headless",
            "--no-sandbox",
            "--disable-gpu",
            "--no-first-run",
            "--enable-logging=stderr",
            "--v=0",
        ])
        .arg(format!("--user-data-dir={}", profile.path().display()))
        .args(extra)
        .arg(format!("file://{}", page.display()))
        .output()
        .expect("chromium runs");
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    (
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

/// Every `href="…"` and `src="…"` of a page that is a relative path.
fn relative_links(html: &str) -> Vec<String> {
    let mut v = Vec::new();
    for attr in ["href=\"", "src=\""] {
        for (i, _) in html.match_indices(attr) {
            let rest = &html[i + attr.len()..];
            let target = &rest[..rest.find('"').unwrap_or(0)];
            if !target.contains(':') && !target.starts_with('#') && !target.is_empty() {
                v.push(target.to_string());
            }
        }
    }
    v
}

#[test]
#[ignore = "needs chromium: run `bash .ci/run` (installs Debian's chromium)"]
fn report_pages_render_in_a_browser() {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = dir.path().join("out");
    // with PNG log plots too: their links must resolve like the rest
    let cfg = demo_config_edited(dir.path(), |t| {
        t.replacen("decimals = 4\n", "decimals = 4\nreport-png = true\n", 1)
    });
    let summary = run_summary(&cfg, &out);
    let index = out.join("report/index.html");
    let (dom, log) = render(&index, &["--dump-dom"]);
    assert!(!log.contains("CONSOLE"), "console output: {log}");
    assert!(dom.contains("id=\"caution\""), "caution missing");
    // the five field crossplots, each with data (the demo has core,
    // capillary plugs, pressures, a trained predictor and a field Rw), the
    // base map, per compartment (East, Main) a cross-section and an FWL
    // chart, and the Monte Carlo's two tornado charts (HPT from SW, and HPT
    // from SWH with the free water levels)
    assert_eq!(dom.matches("<svg").count(), 5 + 1 + 2 * 2 + 2, "plots");
    assert_eq!(
        dom.matches("<g class=\"tornado-zone\">").count(),
        2 * 3,
        "a tornado per zone, in each chart"
    );
    for group in [
        "class=\"points\"",
        "class=\"j-class\"",
        "class=\"compartment\"",
        "class=\"cells\"",
        "class=\"archie-lines\"",
    ] {
        assert!(dom.contains(group), "{group} not rendered");
    }
    assert!(!dom.contains("class=\"no-data\""));
    // the views across wells, rendered: every well on the map, each
    // compartment's wells in its section and chart
    assert_eq!(dom.matches("class=\"cross-section\"").count(), 2);
    assert_eq!(dom.matches("class=\"fwl-agreement\"").count(), 2);
    assert_eq!(dom.matches("class=\"base-map\"").count(), 1);
    assert!(!dom.contains("class=\"no-map\""));
    assert_eq!(dom.matches("<g class=\"map-well").count(), 8);
    assert_eq!(dom.matches("<g class=\"section-well").count(), 8);
    assert_eq!(dom.matches("<g class=\"implied-fwl").count(), 2 * 8);
    let links = relative_links(&std::fs::read_to_string(&index).expect("index"));
    let (data, links_here): (Vec<&String>, Vec<&String>) =
        links.iter().partition(|l| l.starts_with("../"));
    assert_eq!(
        data.len(),
        2,
        "the zone summary and the HPT drivers: {data:?}"
    );
    let (views, well_links): (Vec<&String>, Vec<&String>) = links_here
        .into_iter()
        .partition(|l| l.starts_with("field/"));
    assert_eq!(well_links.len(), 8, "a link per well: {links:?}");
    assert_eq!(views.len(), 1 + 2 * 2, "a link per view: {links:?}");
    for l in &links {
        assert!(out.join("report").join(l).is_file(), "broken link {l}");
    }
    // each standalone view opens on its own, silently
    for l in views {
        let (dom, log) = render(&out.join("report").join(l), &["--dump-dom"]);
        assert!(!log.contains("CONSOLE"), "{l}: console output: {log}");
        assert!(dom.contains("<svg"), "{l} not rendered");
    }

    // a well page: the seven tracks, the class band, one marker per step
    let wells = summary["wells"].as_array().expect("wells");
    let w = &wells[0];
    let steps = w["contacts"]["steps"].as_array().expect("steps").len();
    assert!(steps > 0);
    let page = out.join("report").join(well_links[0]);
    let (dom, log) = render(&page, &["--dump-dom"]);
    assert!(!log.contains("CONSOLE"), "console output: {log}");
    for track in ["depth", "gr", "rt", "dn", "phi", "class", "sw"] {
        assert!(
            dom.contains(&format!("track-{track}")),
            "track-{track} not rendered"
        );
    }
    assert!(dom.contains("class-band"));
    assert!(dom.contains("archie-lines"), "Pickett plot lines");
    assert_eq!(
        dom.matches("class=\"step step-").count(),
        steps,
        "step markers"
    );
    let page_links = relative_links(&std::fs::read_to_string(&page).expect("page"));
    assert!(
        page_links.iter().any(|l| l.ends_with("-log.png")),
        "{page_links:?}"
    );
    for l in page_links {
        let target = page.parent().expect("dir").join(&l);
        assert!(target.is_file(), "broken link {l}");
        if l.ends_with(".png") {
            let png = std::fs::read(&target).expect("png");
            assert!(png.starts_with(b"\x89PNG\r\n\x1a\n") && png.len() > 50_000);
        }
    }

    // the screenshot, kept as a test artefact
    let art = root().join("target/test-artefacts");
    std::fs::create_dir_all(&art).expect("artefact dir");
    let shot = art.join("report-index.png");
    let _ = std::fs::remove_file(&shot);
    render(
        &index,
        &[
            "--hide-scrollbars",
            "--window-size=1400,2400",
            &format!("--screenshot={}", shot.display()),
        ],
    );
    let png = std::fs::read(&shot).expect("screenshot written");
    assert!(
        png.starts_with(b"\x89PNG\r\n\x1a\n") && png.len() > 50_000,
        "{} bytes",
        png.len()
    );
}
