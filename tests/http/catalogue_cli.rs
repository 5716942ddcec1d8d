//! The command line on a database: `tightspec migrate`, `token create|list|revoke`,
//! `catalogue export|import` (a whole file as one revision, or rejected whole).

use std::process::{Command, Output};

use crate::support::db::TestDb;

fn tightspec(db: &TestDb, args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_tightspec"))
        .args(args)
        .env("DATABASE_URL", &db.url)
        .env_remove("RUST_LOG")
        .output()
        .expect("run tightspec")
}

fn stdout(o: &Output) -> String {
    String::from_utf8_lossy(&o.stdout).into_owned()
}

fn stderr(o: &Output) -> String {
    String::from_utf8_lossy(&o.stderr).into_owned()
}

fn temp_file(name: &str, text: &str) -> std::path::PathBuf {
    let path = std::env::temp_dir().join(format!("tightspec_{}_{name}", std::process::id()));
    std::fs::write(&path, text).expect("write temp file");
    path
}

#[tokio::test]
async fn tokens_and_catalogue_import_export_from_the_command_line_sqlite() {
    command_line(TestDb::sqlite(), "sqlite");
}

#[tokio::test]
async fn tokens_and_catalogue_import_export_from_the_command_line_postgres() {
    command_line(TestDb::postgres().await, "postgres");
}

fn command_line(db: TestDb, backend: &str) {
    let o = tightspec(&db, &["migrate"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let migrated = stdout(&o);
    let base: i64 = migrated
        .rsplit("catalogue revision ")
        .next()
        .and_then(|n| n.trim().parse().ok())
        .unwrap_or_else(|| panic!("no revision in {migrated}"));
    assert!(base >= 1);

    // token create prints the secret once; list never shows it
    let o = tightspec(
        &db,
        &[
            "token",
            "create",
            "--name",
            "hollowmere-line-3",
            "--role",
            "editor",
            "--expires",
            "90d",
        ],
    );
    assert!(o.status.success(), "{}", stderr(&o));
    let out = stdout(&o);
    let secret = out
        .split_whitespace()
        .find(|w| w.starts_with("tsk_"))
        .expect("secret printed")
        .to_string();
    assert_eq!(secret.len(), 4 + 64);
    let o = tightspec(&db, &["token", "list"]);
    assert!(stdout(&o).contains("hollowmere-line-3") && !stdout(&o).contains(&secret));
    let o = tightspec(&db, &["token", "create", "--name", "x", "--role", "root"]);
    assert!(!o.status.success());
    // an invalid name: the field and the reason, nothing written
    let o = tightspec(
        &db,
        &["token", "create", "--name", "line 3!", "--role", "editor"],
    );
    assert!(!o.status.success());
    let err = stderr(&o);
    assert!(
        err.contains("`name`") && err.contains("1–64 characters of letters, digits"),
        "{err}"
    );
    assert!(!err.contains("problem(s)"), "{err}");
    assert!(!stdout(&tightspec(&db, &["token", "list"])).contains("line 3!"));
    let o = tightspec(&db, &["token", "revoke", "hollowmere-line-3"]);
    assert!(
        o.status.success() && stdout(&o).contains("revoked"),
        "{}",
        stdout(&o)
    );

    // export CSV, edit one value, import: one new revision
    let o = tightspec(&db, &["catalogue", "export", "--format", "csv"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let csv = stdout(&o);
    let same = temp_file(&format!("{backend}_same.csv"), &csv);
    let o = tightspec(
        &db,
        &[
            "catalogue",
            "import",
            same.to_str().unwrap(),
            "--reason",
            "no-op",
        ],
    );
    assert!(
        o.status.success() && stdout(&o).contains("nothing to import"),
        "{}{}",
        stdout(&o),
        stderr(&o)
    );
    let edited = csv.replacen(
        "7,zinc-electroplated,none,,0.14,",
        "7,zinc-electroplated,none,,0.12,",
        1,
    );
    assert_ne!(edited, csv);
    let edited_file = temp_file(&format!("{backend}_edited.csv"), &edited);
    let o = tightspec(
        &db,
        &[
            "catalogue",
            "import",
            edited_file.to_str().unwrap(),
            "--reason",
            "HW-17 series (demo data)",
        ],
    );
    assert!(o.status.success(), "{}", stderr(&o));
    assert!(
        stdout(&o).contains(&format!("revision {}", base + 1)),
        "{}",
        stdout(&o)
    );

    // a file with several errors is rejected whole, every error listed
    let bad = format!(
        "{}\n7,zinc-electroplated,none,,0.7,0.2,0.14,0.24,,,src,,active,\n,plain,oyl,,0.1,0.2,0.1,0.2,,,src,,active,\n",
        csv.lines().next().unwrap()
    );
    let file = temp_file(&format!("{backend}_bad.csv"), &bad);
    let o = tightspec(
        &db,
        &[
            "catalogue",
            "import",
            file.to_str().unwrap(),
            "--reason",
            "bad",
        ],
    );
    assert!(!o.status.success());
    let err = stderr(&o);
    assert!(err.contains("nothing written"), "{err}");
    assert!(err.contains("entries[0].thread_friction"), "{err}");
    assert!(err.contains("entries[1].lubricant"), "{err}");
    // still the import's revision; JSON export shows it
    let o = tightspec(&db, &["catalogue", "export"]);
    let json: serde_json::Value = serde_json::from_str(&stdout(&o)).expect("JSON export");
    assert_eq!(json["catalogue_revision"], base + 1);
    let o = tightspec(&db, &["catalogue", "export", "--revision", "1"]);
    let old: serde_json::Value = serde_json::from_str(&stdout(&o)).expect("JSON export");
    assert_eq!(old["catalogue_revision"], 1);
    for p in [same, edited_file, file] {
        let _ = std::fs::remove_file(p);
    }
}
