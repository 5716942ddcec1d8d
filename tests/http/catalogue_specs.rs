//! A catalogue change reaches every spec, and a spec asked for at the old
//! revision reproduces the old answer exactly.

use reqwest::StatusCode;
use serde_json::Value;
use tightspec::store::Role;

use crate::catalogue_support::{start, token, Instance};
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(spec_at_an_old_revision_reproduces_the_old_answer);

const SPEC: &str =
    "/v1/tightening-specs?thread=M10&property_class=8.8&finish=zinc-electroplated&lubricant=none";

async fn spec(app: &Instance, extra: &str) -> Value {
    let r = app.get(&format!("{SPEC}{extra}")).await;
    assert_eq!(r.status(), StatusCode::OK, "{SPEC}{extra}");
    r.json().await.expect("spec JSON")
}

async fn spec_at_an_old_revision_reproduces_the_old_answer(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-quality", Role::Editor).await;
    let before = spec(&app, "").await;
    let base = app.revision().await;
    assert_eq!(before["catalogue_revision"], base);
    let id = app
        .get_json("/v1/friction-entries?finish=zinc-electroplated&lubricant=none&status=active")
        .await["entries"][0]["id"]
        .as_i64()
        .expect("entry");
    let (_, etag) = app.entry(id).await;
    assert_eq!(
        app.put_thread_min(&editor, id, Some(&etag), 0.10)
            .await
            .status(),
        StatusCode::OK
    );

    let after = spec(&app, "").await;
    assert_eq!(after["catalogue_revision"], base + 1);
    assert_ne!(
        after["torque"], before["torque"],
        "lower thread friction must change the torque window"
    );
    let pinned = spec(&app, &format!("&catalogue_revision={base}")).await;
    assert_eq!(pinned["catalogue_revision"], base);
    assert_eq!(
        pinned, before,
        "the pinned answer is the old answer, field for field"
    );
    let r = app
        .get(&format!("{SPEC}&catalogue_revision={}", base + 9))
        .await;
    assert_eq!(r.status(), StatusCode::NOT_FOUND);
}
