//! Use cases of the catalogue items that are not friction entries
//! (finishes, lubricants: any [`CatalogueItem`]), written once for every
//! kind: list, read, create, replace.

use super::{AtRevision, Author};
use crate::app::{App, AppError};
use crate::catalogue::{Applied, CatalogueItem};

fn changed<I: CatalogueItem>(applied: &Applied, id: &str) -> Result<AtRevision<I>, AppError> {
    Ok(AtRevision {
        value: I::find(&applied.snapshot, id)?.clone(),
        revision: applied.snapshot.revision,
    })
}

impl App {
    /// Every item of kind `I`, current or at `revision`.
    pub async fn items<I: CatalogueItem>(
        &self,
        revision: Option<i64>,
    ) -> Result<AtRevision<Vec<I>>, AppError> {
        let snap = self.snapshot(revision).await?;
        Ok(AtRevision {
            value: I::all(&snap).to_vec(),
            revision: snap.revision,
        })
    }

    /// One item of kind `I`, current or at `revision` (unknown: 404 with
    /// the nearest ids).
    pub async fn item<I: CatalogueItem>(
        &self,
        id: &str,
        revision: Option<i64>,
    ) -> Result<AtRevision<I>, AppError> {
        let snap = self.snapshot(revision).await?;
        Ok(AtRevision {
            value: I::find(&snap, id)?.clone(),
            revision: snap.revision,
        })
    }

    /// Creates an item of kind `I`.
    pub async fn create_item<I: CatalogueItem>(
        &self,
        by: Author<'_>,
        input: I::Input,
    ) -> Result<AtRevision<I>, AppError> {
        let id = I::input_key(&input).0.to_owned();
        changed(&self.change(by, I::create(input)).await?, &id)
    }

    /// Replaces an item of kind `I`, last seen at `expected_revision`.
    pub async fn update_item<I: CatalogueItem>(
        &self,
        by: Author<'_>,
        input: I::Input,
        expected_revision: i64,
    ) -> Result<AtRevision<I>, AppError> {
        let id = I::input_key(&input).0.to_owned();
        let change = I::update(input, Some(expected_revision));
        changed(&self.change(by, change).await?, &id)
    }
}
