//! The difference between two catalogue revisions, item by item.

use serde::Serialize;
use serde_json::Value;
use utoipa::ToSchema;

use super::change::EntityKind;
use super::Snapshot;

#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, ToSchema)]
#[serde(rename_all = "lowercase")]
pub enum DiffKind {
    /// In `to`, not in `from`.
    Added,
    /// In `from`, not in `to` (only when diffing backwards: nothing is
    /// ever deleted).
    Removed,
    /// In both, different (a retirement is a change of `status`).
    Changed,
}

#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct DiffItem {
    pub entity: EntityKind,
    pub id: String,
    pub change: DiffKind,
    /// Names of the top-level fields that differ (`revision` excluded).
    pub fields: Vec<String>,
    #[schema(value_type = Option<Object>)]
    pub from: Option<Value>,
    #[schema(value_type = Option<Object>)]
    pub to: Option<Value>,
}

fn items<T: Serialize>(
    kind: EntityKind,
    list: &[T],
    id: impl Fn(&T) -> String,
) -> Vec<(EntityKind, String, Value)> {
    list.iter()
        .map(|x| (kind, id(x), serde_json::to_value(x).unwrap_or(Value::Null)))
        .collect()
}

fn all(s: &Snapshot) -> Vec<(EntityKind, String, Value)> {
    let mut v = items(EntityKind::Finish, &s.finishes, |f| f.id.clone());
    v.extend(items(EntityKind::Lubricant, &s.lubricants, |l| {
        l.id.clone()
    }));
    v.extend(items(EntityKind::FrictionEntry, &s.entries, |e| {
        e.id.to_string()
    }));
    v
}

fn changed_fields(a: &Value, b: &Value) -> Vec<String> {
    let (Some(a), Some(b)) = (a.as_object(), b.as_object()) else {
        return Vec::new();
    };
    let mut keys: Vec<&String> = a.keys().chain(b.keys()).collect();
    keys.sort();
    keys.dedup();
    keys.into_iter()
        .filter(|k| k.as_str() != "revision" && a.get(*k) != b.get(*k))
        .cloned()
        .collect()
}

/// Every item that differs between `from` and `to`: finishes, then
/// lubricants, then friction entries, each ordered by id.
pub fn diff(from: &Snapshot, to: &Snapshot) -> Vec<DiffItem> {
    let a = all(from);
    let b = all(to);
    let mut out = Vec::new();
    for (kind, id, av) in &a {
        match b.iter().find(|(k, i, _)| k == kind && i == id) {
            Some((_, _, bv)) => {
                let fields = changed_fields(av, bv);
                if !fields.is_empty() {
                    out.push(DiffItem {
                        entity: *kind,
                        id: id.clone(),
                        change: DiffKind::Changed,
                        fields,
                        from: Some(av.clone()),
                        to: Some(bv.clone()),
                    });
                }
            }
            None => out.push(DiffItem {
                entity: *kind,
                id: id.clone(),
                change: DiffKind::Removed,
                fields: Vec::new(),
                from: Some(av.clone()),
                to: None,
            }),
        }
    }
    for (kind, id, bv) in &b {
        if !a.iter().any(|(k, i, _)| k == kind && i == id) {
            out.push(DiffItem {
                entity: *kind,
                id: id.clone(),
                change: DiffKind::Added,
                fields: Vec::new(),
                from: None,
                to: Some(bv.clone()),
            });
        }
    }
    let rank = |k: EntityKind| match k {
        EntityKind::Finish => 0,
        EntityKind::Lubricant => 1,
        EntityKind::FrictionEntry => 2,
    };
    let num = |id: &str| id.parse::<i64>().unwrap_or(i64::MAX);
    out.sort_by(|x, y| {
        rank(x.entity)
            .cmp(&rank(y.entity))
            .then(num(&x.id).cmp(&num(&y.id)))
            .then(x.id.cmp(&y.id))
    });
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::catalogue::{apply, Change, ChangeSet, EntryInput};

    #[test]
    fn diff_lists_changed_fields_and_additions() {
        let seed = Snapshot::seed_revision_1();
        assert!(diff(&seed, &seed).is_empty());
        let mut e = EntryInput::from(seed.entry(7).unwrap());
        e.thread_friction.min = 0.12;
        e.status = None;
        let r2 = apply(
            &seed,
            &ChangeSet::single(
                "a",
                "r",
                Change::UpdateEntry {
                    id: 7,
                    expected_revision: Some(1),
                    entry: e,
                },
            ),
        )
        .unwrap()
        .snapshot;
        let d = diff(&seed, &r2);
        assert_eq!(d.len(), 1);
        assert_eq!(d[0].id, "7");
        assert_eq!(d[0].change, DiffKind::Changed);
        assert_eq!(d[0].fields, vec!["thread_friction".to_string()]);
        let back = diff(&r2, &seed);
        assert_eq!(back[0].to.as_ref().unwrap()["thread_friction"]["min"], 0.14);
    }
}
