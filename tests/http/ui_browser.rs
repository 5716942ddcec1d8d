//! The page in a real browser: Debian's `chromium`, headless, driven
//! through WebDriver (`chromedriver` and the `fantoccini` crate) against a
//! spawned service. Opens the calculator, fills the form, submits and finds
//! the answer table and the chart element; opens a catalogue entry's
//! history; tries to record a friction test without a token and sees it
//! refused (nothing written). Screenshots go to `target/ui-screenshots/`.
//!
//! `scripts/test` installs `chromium` and `chromium-driver` when missing.
//! Without them the test says so and passes, unless `CI` is set: then it
//! fails.

use std::path::{Path, PathBuf};
use std::process::{Child, Command, Stdio};

use fantoccini::{Client, ClientBuilder, Locator};

use crate::catalogue_support::start;
use crate::support::db::TestDb;
use crate::support::loopback_base;
use crate::ui::DEMO_CSV;

fn on_path(name: &str) -> Option<PathBuf> {
    std::env::var_os("PATH").and_then(|paths| {
        std::env::split_paths(&paths)
            .map(|d| d.join(name))
            .find(|p| p.is_file())
    })
}

/// The browser and its driver, or why the test cannot run.
fn browser() -> Result<(PathBuf, PathBuf), String> {
    let chromium = ["chromium", "chromium-browser", "google-chrome"]
        .iter()
        .find_map(|n| on_path(n))
        .ok_or("no chromium on PATH")?;
    let driver = on_path("chromedriver").ok_or("no chromedriver on PATH")?;
    Ok((chromium, driver))
}

/// chromedriver on a free loopback port, stopped when dropped.
struct Driver {
    child: Child,
    port: u16,
}

impl Drop for Driver {
    fn drop(&mut self) {
        let _ = self.child.kill();
        let _ = self.child.wait();
    }
}

fn free_port() -> u16 {
    std::net::TcpListener::bind("127.0.0.1:0")
        .and_then(|l| l.local_addr())
        .map(|a| a.port())
        .expect("a free port")
}

/// Starts chromedriver and waits until its output says it listens (or it
/// ends). A thread keeps draining its output so it never blocks on it.
fn driver(path: &Path) -> Driver {
    use std::io::{BufRead, BufReader};
    let port = free_port();
    let mut child = Command::new(path)
        .arg(format!("--port={port}"))
        .stdout(Stdio::piped())
        .stderr(Stdio::null())
        .spawn()
        .expect("chromedriver starts");
    let out = child.stdout.take().expect("chromedriver output");
    let (tx, rx) = std::sync::mpsc::channel();
    std::thread::spawn(move || {
        for line in BufReader::new(out).lines().map_while(Result::ok) {
            if line.contains("started successfully") {
                let _ = tx.send(());
            }
        }
    });
    let driver = Driver { child, port };
    assert!(
        rx.recv().is_ok(),
        "chromedriver ended without listening on port {port}"
    );
    driver
}

async fn session(driver: &Driver, chromium: &Path) -> Client {
    let mut caps = serde_json::Map::new();
    caps.insert(
        "goog:chromeOptions".into(),
        serde_json::json!({
            "binary": chromium,
            "args": ["--headless=new", "--no-sandbox", "--disable-dev-shm-usage",
                     "--disable-gpu", "--window-size=1400,1100", "--force-device-scale-factor=1"],
        }),
    );
    ClientBuilder::new(hyper_util::client::legacy::connect::HttpConnector::new())
        .capabilities(caps)
        .connect(&loopback_base(driver.port))
        .await
        .expect("a WebDriver session")
}

fn screenshots() -> PathBuf {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("../target/ui-screenshots");
    std::fs::create_dir_all(&dir).expect("screenshot folder");
    dir
}

async fn shot(c: &Client, name: &str) {
    let png = c.screenshot().await.expect("screenshot");
    std::fs::write(screenshots().join(name), png).expect("screenshot written");
}

async fn fill(c: &Client, id: &str, value: &str) {
    let field = c
        .find(Locator::Id(id))
        .await
        .unwrap_or_else(|e| panic!("#{id}: {e}"));
    field.clear().await.expect("clear");
    field.send_keys(value).await.expect("type");
}

#[tokio::test(flavor = "multi_thread", worker_threads = 4)]
async fn engineer_uses_the_page_in_a_real_browser() {
    let (chromium, driver_path) = match browser() {
        Ok(found) => found,
        Err(why) if std::env::var_os("CI").is_none() => {
            eprintln!("SKIPPED ui_browser: {why}; install Debian's chromium and chromium-driver (scripts/test does)");
            return;
        }
        Err(why) => panic!("CI is set and the browser test cannot run: {why}"),
    };
    let db = TestDb::sqlite();
    let app = start(&db.url, true).await;
    let driver = driver(&driver_path);
    let c = session(&driver, &chromium).await;
    let result = drive(&c, &app.base).await;
    let _ = c.close().await;
    result.expect("the browser walk-through");
    let r = app.get("/v1/friction-tests/1").await;
    assert_eq!(r.status(), 404, "a refused page write stored a series");
}

async fn drive(c: &Client, base: &str) -> Result<(), fantoccini::error::CmdError> {
    // The calculator: fill the form, submit, see the table and the chart.
    c.goto(&format!("{base}/ui/spec")).await?;
    fill(c, "thread", "M10").await;
    fill(c, "property_class", "8.8").await;
    fill(c, "finish", "zinc-flake-lubricated").await;
    fill(c, "lubricant", "none").await;
    fill(c, "tightening_method", "dc-nutrunner").await;
    fill(c, "clamp_length", "40mm").await;
    c.find(Locator::Id("compute")).await?.click().await?;
    let table = c.wait().for_element(Locator::Id("answer")).await?;
    let text = table.text().await?;
    assert!(
        text.contains("Target torque") && text.contains("N·m"),
        "{text}"
    );
    let chart = c.find(Locator::Id("window-chart")).await?;
    let src = chart.attr("src").await?.unwrap_or_default();
    assert!(
        src.starts_with("/v1/tightening-specs/chart.svg?")
            || src.contains("/v1/tightening-specs/chart.svg?"),
        "{src}"
    );
    let url = c.current_url().await?;
    assert!(
        url.as_str().contains("/ui/spec?") && url.as_str().contains("thread=M10"),
        "{url}"
    );
    shot(c, "calculator.png").await;

    // Bad input: the problem names the field in the page.
    fill(c, "utilisation", "3").await;
    c.find(Locator::Id("compute")).await?.click().await?;
    let problem = c
        .wait()
        .for_element(Locator::Css("section.problem"))
        .await?;
    let text = problem.text().await?;
    assert!(text.contains("utilisation"), "{text}");
    shot(c, "calculator-refused.png").await;

    // A catalogue entry's history.
    c.goto(&format!("{base}/ui/catalogue")).await?;
    c.wait().for_element(Locator::Id("entries")).await?;
    shot(c, "catalogue.png").await;
    c.find(Locator::Css("#entries tbody tr a"))
        .await?
        .click()
        .await?;
    let history = c.wait().for_element(Locator::Id("history")).await?;
    assert!(history.text().await?.contains("History"), "history table");
    let img = c.find(Locator::Id("history-chart")).await?;
    let src = img.attr("src").await?.unwrap_or_default();
    assert!(src.contains("/history.svg"), "{src}");
    shot(c, "entry-history.png").await;

    // A write without a token: refused in the page.
    c.goto(&format!("{base}/ui/friction-tests")).await?;
    fill(c, "thread", "M10").await;
    fill(c, "property_class", "8.8").await;
    fill(c, "finish", "zinc-flake-lubricated").await;
    fill(c, "lubricant", "none").await;
    c.find(Locator::Id("csv"))
        .await?
        .send_keys(DEMO_CSV)
        .await?;
    c.find(Locator::Id("record")).await?.click().await?;
    let refusal = c
        .wait()
        .for_element(Locator::Css("section.problem"))
        .await?;
    let text = refusal.text().await?;
    assert!(text.contains("401") && text.contains("token"), "{text}");
    shot(c, "record-without-token.png").await;

    // Evaluating is a read and works without a token.
    c.find(Locator::Id("evaluate")).await?.click().await?;
    let evaluation = c.wait().for_element(Locator::Id("evaluation")).await?;
    assert!(
        evaluation.text().await?.contains("Thread friction"),
        "evaluation"
    );
    shot(c, "friction-evaluation.png").await;
    Ok(())
}
