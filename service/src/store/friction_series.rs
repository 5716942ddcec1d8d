//! Stored friction test series (evidence for catalogue changes) and the
//! catalogue revisions made from them. Both tables are immutable: the
//! database refuses UPDATE and DELETE (migration 20261202090000).

use chrono::{DateTime, Utc};
use serde::Serialize;

use super::backend::dispatch;
use super::{Store, StoreError};

/// A series to store: the posted series and its evaluation, as JSON text.
#[derive(Debug, Clone, PartialEq)]
pub struct NewSeries {
    pub actor: String,
    pub thread: String,
    pub property_class: Option<String>,
    pub finish: String,
    pub lubricant: String,
    pub catalogue_revision: i64,
    pub series_json: String,
    pub evaluation_json: String,
}

/// A stored series.
#[derive(Debug, Clone, PartialEq, sqlx::FromRow)]
pub struct StoredSeries {
    pub id: i64,
    pub created_at: DateTime<Utc>,
    pub actor: String,
    pub thread: String,
    pub property_class: Option<String>,
    pub finish: String,
    pub lubricant: String,
    pub catalogue_revision: i64,
    pub series_json: String,
    pub evaluation_json: String,
}

/// A catalogue revision made from a series (named `Application` on the wire).
#[derive(Debug, Clone, PartialEq, Serialize, utoipa::ToSchema, sqlx::FromRow)]
#[schema(as = Application, description = "A catalogue revision made from a series.")]
pub struct SeriesApplication {
    pub series_id: i64,
    pub revision: i64,
    pub entry_id: i64,
    /// `observed` or `three_sigma`.
    pub basis: String,
    pub actor: String,
    pub reason: String,
    #[schema(value_type = String, format = DateTime)]
    pub created_at: DateTime<Utc>,
}

/// Evidence string recorded with a catalogue revision made from series `id`.
pub fn evidence(id: i64) -> String {
    format!("friction-test:{id}")
}

const SERIES_COLUMNS: &str = "SELECT id, created_at, actor, thread, property_class, finish, \
     lubricant, catalogue_revision, series_json, evaluation_json FROM friction_test_series";

const INSERT_SERIES: &str = "INSERT INTO friction_test_series (created_at, actor, thread, \
     property_class, finish, lubricant, catalogue_revision, series_json, evaluation_json) \
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9) RETURNING id";

const INSERT_APPLICATION: &str = "INSERT INTO friction_test_applications (series_id, revision, \
     entry_id, basis, actor, reason, created_at) VALUES ($1, $2, $3, $4, $5, $6, $7)";

const APPLICATIONS: &str = "SELECT series_id, revision, entry_id, basis, actor, reason, \
     created_at FROM friction_test_applications WHERE series_id = $1 ORDER BY seq";

impl Store {
    /// Stores a series; returns it with its id and time.
    #[tracing::instrument(skip_all, level = "debug", fields(actor = %s.actor, thread = %s.thread))]
    pub async fn insert_friction_test(&self, s: &NewSeries) -> Result<StoredSeries, StoreError> {
        let now = Utc::now();
        let id: i64 = dispatch!(Store, self, |pool| sqlx::query_scalar(INSERT_SERIES)
            .bind(now)
            .bind(&s.actor)
            .bind(&s.thread)
            .bind(&s.property_class)
            .bind(&s.finish)
            .bind(&s.lubricant)
            .bind(s.catalogue_revision)
            .bind(&s.series_json)
            .bind(&s.evaluation_json)
            .fetch_one(pool)
            .await?);
        self.friction_test(id).await
    }

    /// A stored series by id (`NotFound` naming `id`).
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn friction_test(&self, id: i64) -> Result<StoredSeries, StoreError> {
        let sql = format!("{SERIES_COLUMNS} WHERE id = $1");
        let found: Option<StoredSeries> = dispatch!(Store, self, |pool| sqlx::query_as(&sql)
            .bind(id)
            .fetch_optional(pool)
            .await?);
        found.ok_or_else(|| StoreError::NotFound {
            field: "id".into(),
            reason: format!("no friction test series {id}"),
        })
    }

    /// Records that `a.revision` was made from series `a.series_id`.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn record_friction_test_application(
        &self,
        a: &SeriesApplication,
    ) -> Result<(), StoreError> {
        dispatch!(Store, self, |pool| sqlx::query(INSERT_APPLICATION)
            .bind(a.series_id)
            .bind(a.revision)
            .bind(a.entry_id)
            .bind(&a.basis)
            .bind(&a.actor)
            .bind(&a.reason)
            .bind(a.created_at)
            .execute(pool)
            .await
            .map(drop)?);
        Ok(())
    }

    /// Catalogue revisions made from a series, oldest first.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn friction_test_applications(
        &self,
        series_id: i64,
    ) -> Result<Vec<SeriesApplication>, StoreError> {
        Ok(dispatch!(Store, self, |pool| sqlx::query_as(APPLICATIONS)
            .bind(series_id)
            .fetch_all(pool)
            .await?))
    }
}
