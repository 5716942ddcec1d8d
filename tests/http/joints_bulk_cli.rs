//! `tightspec joint import|export` on a database, by the same rules as
//! the API: an export re-imports unchanged, a new joint is created, a bad
//! row is refused by name with nothing written. Demo data.

use std::process::{Command, Output};

use serde_json::{json, Value};

use crate::support::db::TestDb;

fn tightspec(db: &TestDb, args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_tightspec"))
        .args(args)
        .env("DATABASE_URL", &db.url)
        .env_remove("RUST_LOG")
        .output()
        .expect("run tightspec")
}

fn text(o: &Output) -> String {
    format!(
        "{}{}",
        String::from_utf8_lossy(&o.stdout),
        String::from_utf8_lossy(&o.stderr)
    )
}

fn definition(id: &str) -> Value {
    json!({"id": id, "title": "Demo joint: door hinge to A-pillar", "tags": ["demo-doors"],
           "request": {"thread": "M8", "property_class": "10.9",
                       "thread_friction": 0.12, "bearing_friction": 0.12},
           "setpoints": {"torque_unit": "N·m", "resolution": 0.1}})
}

#[tokio::test]
async fn joints_are_imported_and_exported_from_the_command_line_sqlite() {
    command_line(TestDb::sqlite()).await;
}

#[tokio::test]
async fn joints_are_imported_and_exported_from_the_command_line_postgres() {
    command_line(TestDb::postgres().await).await;
}

async fn command_line(db: TestDb) {
    let o = tightspec(&db, &["migrate"]);
    assert!(o.status.success(), "{}", text(&o));
    let backend = if db.url.starts_with("postgres") {
        "pg"
    } else {
        "sqlite"
    };
    let dir = std::env::temp_dir().join(format!(
        "tightspec-bulk-cli-{}-{backend}",
        std::process::id()
    ));
    std::fs::create_dir_all(&dir).unwrap();
    let json_file = dir.join("joints.json");
    let body = json!({"joints": [definition("DEMO-DH-01")]});
    std::fs::write(&json_file, body.to_string()).unwrap();
    let path = json_file.to_str().unwrap();

    // without a reason: refused by name, nothing written
    let o = tightspec(&db, &["joint", "import", path, "--by", "demo-planning"]);
    assert!(!o.status.success());
    assert!(text(&o).contains("reason"), "{}", text(&o));
    let o = tightspec(
        &db,
        &[
            "joint",
            "import",
            path,
            "--by",
            "demo-planning",
            "--reason",
            "demo: doors",
        ],
    );
    assert!(o.status.success(), "{}", text(&o));
    assert!(
        text(&o).contains("created 1, updated 0, unchanged 0"),
        "{}",
        text(&o)
    );

    // the CSV export, with a BOM, re-imports unchanged
    let o = tightspec(&db, &["joint", "export", "--format", "csv", "--bom"]);
    assert!(o.status.success(), "{}", text(&o));
    let csv = String::from_utf8(o.stdout).unwrap();
    assert!(csv.starts_with("\u{feff}id,title,tags,"), "{csv}");
    let csv_file = dir.join("joints.csv");
    std::fs::write(&csv_file, &csv).unwrap();
    let csv_path = csv_file.to_str().unwrap();
    let o = tightspec(
        &db,
        &[
            "joint",
            "import",
            csv_path,
            "--by",
            "demo-planning",
            "--reason",
            "demo: again",
        ],
    );
    assert!(
        text(&o).contains("created 0, updated 0, unchanged 1"),
        "{}",
        text(&o)
    );

    // a bad row names its row and column
    std::fs::write(&csv_file, csv.replace(",M8,", ",M800,")).unwrap();
    let o = tightspec(
        &db,
        &[
            "joint",
            "import",
            csv_path,
            "--by",
            "demo-planning",
            "--reason",
            "demo",
        ],
    );
    assert!(!o.status.success());
    assert!(text(&o).contains("rows[0].thread"), "{}", text(&o));

    // the JSON export holds the definition as given
    let o = tightspec(&db, &["joint", "export"]);
    let export: Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(
        export["joints"][0]["request"],
        definition("DEMO-DH-01")["request"]
    );
    std::fs::remove_dir_all(&dir).ok();
}
