//! Stored friction test series: kept as posted, immutable in the database,
//! and linked to the catalogue revisions made from them. Both backends.

use chrono::Utc;
use tightspec::store::friction_series::{evidence, NewSeries, SeriesApplication};
use tightspec::store::{Store, StoreError};

use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(
    a_series_is_stored_and_read_back,
    stored_series_cannot_be_changed_or_deleted,
);

fn series() -> NewSeries {
    NewSeries {
        actor: "hollowmere-lab".into(),
        thread: "M10".into(),
        property_class: Some("8.8".into()),
        finish: "zinc-flake".into(),
        lubricant: "none".into(),
        catalogue_revision: 1,
        series_json: r#"{"thread":"M10"}"#.into(),
        evaluation_json: r#"{"specimens":[]}"#.into(),
    }
}

async fn a_series_is_stored_and_read_back(db: &TestDb) {
    let store = Store::open(Some(&db.url)).await.unwrap();
    let stored = store.insert_friction_test(&series()).await.unwrap();
    assert!(stored.id >= 1);
    let read = store.friction_test(stored.id).await.unwrap();
    assert_eq!(read, stored);
    assert_eq!(read.series_json, series().series_json);
    let missing = store.friction_test(stored.id + 100).await.unwrap_err();
    assert!(
        matches!(missing, StoreError::NotFound { .. }),
        "{missing:?}"
    );
    assert!(store
        .friction_test_applications(stored.id)
        .await
        .unwrap()
        .is_empty());
    assert_eq!(evidence(stored.id), format!("friction-test:{}", stored.id));
}

async fn stored_series_cannot_be_changed_or_deleted(db: &TestDb) {
    let store = Store::open(Some(&db.url)).await.unwrap();
    let stored = store.insert_friction_test(&series()).await.unwrap();
    store
        .record_friction_test_application(&SeriesApplication {
            series_id: stored.id,
            revision: 1,
            entry_id: 1,
            basis: "observed".into(),
            actor: "hollowmere-lab".into(),
            reason: "test".into(),
            created_at: Utc::now(),
        })
        .await
        .unwrap();
    let statements = [
        "UPDATE friction_test_series SET thread = 'M12'",
        "DELETE FROM friction_test_series",
        "UPDATE friction_test_applications SET basis = 'three_sigma'",
        "DELETE FROM friction_test_applications",
    ];
    for sql in statements {
        let refused = match &store {
            Store::Postgres(p) => sqlx::query(sql).execute(p).await.is_err(),
            Store::Sqlite(p) => sqlx::query(sql).execute(p).await.is_err(),
        };
        assert!(refused, "the database accepted: {sql}");
    }
    assert_eq!(store.friction_test(stored.id).await.unwrap(), stored);
    let apps = store.friction_test_applications(stored.id).await.unwrap();
    assert_eq!(apps.len(), 1);
    assert_eq!(apps[0].basis, "observed");
}
