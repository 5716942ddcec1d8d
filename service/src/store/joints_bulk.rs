//! A bulk import of joint definitions: every definition created or
//! replaced in ONE transaction (all or nothing), each change with its
//! `joint_history` row carrying the import's reason. A definition equal to
//! the stored one is left alone (no new version, no history row).

use chrono::Utc;

use super::backend::{dispatch, Tx};
use super::joints::{joint_in, update_in, write_tags_and_history, INSERT};
use super::{Store, StoreError};
use crate::registry::{Joint, JointDefinition, JointId};

/// What an import did to each joint, in the order given.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct ImportOutcome {
    pub created: Vec<JointId>,
    pub updated: Vec<JointId>,
    pub unchanged: Vec<JointId>,
}

fn json(v: &impl serde::Serialize) -> Result<String, StoreError> {
    Ok(serde_json::to_string(v)?)
}

impl Store {
    /// Creates the definitions not yet stored and replaces those stored
    /// that differ (`same` says whether a stored joint already holds the
    /// definition), in one transaction; nothing is written on any failure.
    #[tracing::instrument(skip_all, level = "debug", fields(joints = defs.len()))]
    pub async fn import_joints(
        &self,
        defs: &[JointDefinition],
        same: fn(&Joint, &JointDefinition) -> bool,
        actor: &str,
        reason: &str,
    ) -> Result<ImportOutcome, StoreError> {
        let mut tx = Tx::write(self).await?;
        let mut out = ImportOutcome::default();
        let now = Utc::now();
        for def in defs {
            let current = match tx.lock_joint(def.id.as_str()).await? {
                Some(_) => joint_in(&mut tx, &def.id).await?,
                None => None,
            };
            let (tags, request, setpoints) =
                (json(&def.tags)?, json(&def.request)?, json(&def.setpoints)?);
            match current {
                Some(current) if same(&current, def) => out.unchanged.push(def.id.clone()),
                Some(current) => {
                    update_in(&mut tx, def, &current, actor, reason, now).await?;
                    out.updated.push(def.id.clone());
                }
                None => {
                    dispatch!(Tx, &mut tx, |c| sqlx::query(INSERT)
                        .bind(def.id.as_str())
                        .bind(&def.title)
                        .bind(&tags)
                        .bind(&request)
                        .bind(&setpoints)
                        .bind(now)
                        .execute(&mut **c)
                        .await
                        .map(drop)?);
                    let change = ("create", 1, None);
                    write_tags_and_history(&mut tx, def, change, actor, reason, now).await?;
                    out.created.push(def.id.clone());
                }
            }
        }
        tx.commit().await?;
        Ok(out)
    }
}
