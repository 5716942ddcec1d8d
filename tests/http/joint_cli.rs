//! `tightspec joint list|show|release|approve|withdraw` on a database, by
//! the same rules as the API: the four-eyes rule refuses the requester's
//! own approval, an error check is refused until accepted with a reason,
//! and `token create --role approver` makes an approver. Demo data.

use std::process::{Command, Output};

use serde_json::{json, Value};

use crate::support::db::TestDb;

fn tightspec(db: &TestDb, args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_tightspec"))
        .args(args)
        .env("DATABASE_URL", &db.url)
        .env_remove("RUST_LOG")
        .env_remove("TIGHTSPEC_FOUR_EYES")
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

async fn define(db: &TestDb, id: &str, request: Value) {
    let app = tightspec::app::App::open(Some(&db.url)).await.expect("app");
    let body = json!({"id": id, "title": "Demo joint (Hollowmere Works)", "tags": ["hollowmere-demo"],
                      "request": request, "setpoints": {"torque_unit": "N·m", "resolution": 0.1}});
    app.create_joint("hollowmere-planning", &body)
        .await
        .expect("joint");
    app.close().await;
}

#[tokio::test]
async fn joints_are_released_from_the_command_line_sqlite() {
    command_line(TestDb::sqlite()).await;
}

#[tokio::test]
async fn joints_are_released_from_the_command_line_postgres() {
    command_line(TestDb::postgres().await).await;
}

async fn command_line(db: TestDb) {
    let o = tightspec(&db, &["migrate"]);
    assert!(o.status.success(), "{}", text(&o));
    define(
        &db,
        "HW-K4-RA-017",
        json!({"thread": "M10", "property_class": "8.8",
               "finish": "zinc-electroplated", "lubricant": "none"}),
    )
    .await;
    define(
        &db,
        "HW-K4-GB-003",
        json!({"thread": "M8", "property_class": "8.8", "finish": "zinc-electroplated",
               "lubricant": "none", "tightening_method": "dc-nutrunner",
               "joint_type": "tapped-hole", "clamped_material": "aluminium-6082",
               "engagement_length": {"value": 12, "unit": "mm"}}),
    )
    .await;

    let o = tightspec(
        &db,
        &[
            "token",
            "create",
            "--name",
            "hw-approver",
            "--role",
            "approver",
        ],
    );
    assert!(o.status.success(), "{}", text(&o));
    assert!(text(&o).contains("approver"), "{}", text(&o));

    let o = tightspec(&db, &["joint", "list", "--tag", "hollowmere-demo"]);
    assert!(o.status.success(), "{}", text(&o));
    assert!(text(&o).contains("HW-K4-GB-003") && text(&o).contains("HW-K4-RA-017"));

    // Four-eyes: a draft; the requester may not approve it, someone else may.
    let release = [
        "joint",
        "--four-eyes",
        "true",
        "release",
        "HW-K4-RA-017",
        "--by",
        "anna",
        "--reason",
        "pilot build",
    ];
    let o = tightspec(&db, &release);
    assert!(o.status.success(), "{}", text(&o));
    assert!(text(&o).contains("release 1  draft"), "{}", text(&o));
    let approve = |by: &str| {
        tightspec(
            &db,
            &[
                "joint",
                "approve",
                "HW-K4-RA-017",
                "1",
                "--by",
                by,
                "--reason",
                "checked",
            ],
        )
    };
    let o = approve("anna");
    assert!(!o.status.success());
    assert!(text(&o).contains("four-eyes"), "{}", text(&o));
    let o = approve("ben");
    assert!(o.status.success(), "{}", text(&o));
    assert!(text(&o).contains("released") && text(&o).contains("approved by ben"));

    // An error check is refused by name until accepted with a reason.
    let mut release = vec![
        "joint",
        "--json",
        "release",
        "HW-K4-GB-003",
        "--by",
        "anna",
        "--reason",
        "gearbox cover",
    ];
    let o = tightspec(&db, &release);
    assert!(!o.status.success());
    assert!(
        text(&o).contains("accept_checks: error check"),
        "{}",
        text(&o)
    );
    release.extend([
        "--accept",
        "surface_pressure_exceeded=hardened washer fitted",
        "--accept",
        "thread_engagement_too_short=thread insert per drawing",
    ]);
    let o = tightspec(&db, &release);
    assert!(o.status.success(), "{}", text(&o));
    let view: Value = serde_json::from_slice(&o.stdout).expect("--json");
    assert_eq!(view["status"], "released");
    assert_eq!(
        view["accepted_checks"][0]["reason"],
        "hardened washer fitted"
    );

    // Show, then withdraw; a second withdrawal names the status.
    let o = tightspec(&db, &["joint", "show", "HW-K4-RA-017"]);
    assert!(o.status.success(), "{}", text(&o));
    assert!(text(&o).contains("release 1  released"), "{}", text(&o));
    let withdraw = [
        "joint",
        "withdraw",
        "HW-K4-RA-017",
        "1",
        "--by",
        "anna",
        "--reason",
        "wrong washer",
    ];
    assert!(tightspec(&db, &withdraw).status.success());
    let o = tightspec(&db, &withdraw);
    assert!(!o.status.success());
    assert!(text(&o).contains("withdrawn"), "{}", text(&o));
    let o = tightspec(&db, &["joint", "show", "HW-K4-RA-071"]);
    assert!(!o.status.success());
    assert!(text(&o).contains("HW-K4-RA-017"), "near id: {}", text(&o));
}
