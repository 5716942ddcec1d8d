//! Where the friction of a spec comes from: the request's own values, or
//! the catalogue entry for the finish and lubricant, each side separately.
//! Records the provenance of every value (catalogue entry id and revision,
//! or "given in the request") and turns it into the engine's validated
//! friction ranges.

use crate::catalogue::types::joint_tag_problem;
use crate::catalogue::{FrictionEntry, FrictionMatch, Snapshot};
use crate::engine::quantity::FrictionRange;

use super::request::{FrictionInput, SpecRequest};
use crate::app::FieldProblem;

/// Where one friction range came from.
#[derive(Debug, Clone, PartialEq)]
pub enum FrictionOrigin {
    /// Given in the request.
    Request,
    /// The catalogue entry with this id at this entry revision.
    Catalogue {
        entry_id: i64,
        entry_revision: i64,
        reference: String,
    },
}

/// Why the catalogue entry used was chosen: the joint tag it is limited
/// to (absent: the generic entry) and the reason in words.
#[derive(Debug, Clone, PartialEq)]
pub struct FrictionScope {
    pub joint_tag: Option<String>,
    pub reason: String,
}

/// The joint tags of a request, each checked as a catalogue entry's tag
/// is (1–64 characters, not blank, no control characters), at most
/// [`JOINT_TAGS_MAX`], none repeated; problems name `joint_tags[i]`.
pub const JOINT_TAGS_MAX: usize = 32;

fn joint_tags(req: &SpecRequest, problems: &mut Vec<FieldProblem>) -> Vec<String> {
    let Some(tags) = &req.joint_tags else {
        return Vec::new();
    };
    if tags.len() > JOINT_TAGS_MAX {
        problems.push(FieldProblem::invalid(
            "joint_tags",
            format!("at most {JOINT_TAGS_MAX} joint tags, {} given", tags.len()),
        ));
        return Vec::new();
    }
    for (i, tag) in tags.iter().enumerate() {
        if let Some(reason) = joint_tag_problem(tag) {
            problems.push(FieldProblem::invalid(format!("joint_tags[{i}]"), reason));
        } else if let Some(j) = tags[..i].iter().position(|t| t == tag) {
            problems.push(FieldProblem::invalid(
                format!("joint_tags[{i}]"),
                format!("repeats joint_tags[{j}]"),
            ));
        }
    }
    tags.clone()
}

/// Friction values resolved for one request, with the catalogue facts the
/// engine's checks need as plain flags.
#[derive(Debug, Clone, PartialEq)]
pub struct ResolvedFriction {
    pub thread: FrictionRange,
    pub thread_origin: FrictionOrigin,
    pub bearing: FrictionRange,
    pub bearing_origin: FrictionOrigin,
    /// Finish id as in the catalogue, when given.
    pub finish: Option<String>,
    /// Lubricant id as in the catalogue, when given.
    pub lubricant: Option<String>,
    /// The finish is electroplated (hydrogen-embrittlement caution, ISO 4042).
    pub electroplated: bool,
    /// The finish is austenitic stainless (galling caution when dry).
    pub stainless: bool,
    /// Hot-dip galvanized (ISO 10684 scope check).
    pub hot_dip_galvanized: bool,
    /// Phosphated or otherwise acid-cleaned (hydrogen caution, ISO 4042).
    pub acid_cleaned: bool,
    /// No lubricant added at assembly.
    pub dry: bool,
    /// The catalogue entry's thread and bearing ranges, when an entry
    /// applies, so the engine can flag request values outside them.
    pub catalogue_ranges: Option<(FrictionRange, FrictionRange)>,
    /// Why the catalogue entry was chosen, when one side's values come
    /// from it.
    pub scope: Option<FrictionScope>,
}

fn origin_of(entry: &FrictionEntry) -> FrictionOrigin {
    FrictionOrigin::Catalogue {
        entry_id: entry.id,
        entry_revision: entry.revision,
        reference: entry.source.clone(),
    }
}

/// Resolves the friction of `req` against `snapshot`, collecting every
/// problem into `problems`; returns `None` when something is missing.
pub fn resolve_friction(
    req: &SpecRequest,
    snapshot: &Snapshot,
    problems: &mut Vec<FieldProblem>,
) -> Option<ResolvedFriction> {
    let start = problems.len();
    let mut check = |field: &str, given: Option<FrictionInput>| {
        let given = given?;
        let (min, max) = given.bounds();
        match FrictionRange::new(min, max, field) {
            Ok(r) => Some(r),
            Err(e) => {
                let mut e = FieldProblem::from(e);
                if let FrictionInput::Single(_) = given {
                    // One value: name the field itself, not its `.min` end.
                    e.field = field.to_string();
                }
                problems.push(e);
                None
            }
        }
    };
    let thread_given = check("thread_friction", req.thread_friction);
    let bearing_given = check("bearing_friction", req.bearing_friction);
    let tags = joint_tags(req, problems);

    let finish = req
        .finish
        .as_deref()
        .and_then(|id| match snapshot.finish(id) {
            Ok(f) => Some(f),
            Err(e) => {
                problems.extend(crate::app::error::catalogue_problems(&e));
                None
            }
        });
    let lubricant = req
        .lubricant
        .as_deref()
        .and_then(|id| match snapshot.lubricant(id) {
            Ok(l) => Some(l),
            Err(e) => {
                problems.extend(crate::app::error::catalogue_problems(&e));
                None
            }
        });

    let need_catalogue = req.thread_friction.is_none() || req.bearing_friction.is_none();
    if need_catalogue {
        let missing: Vec<&str> = [
            ("thread_friction", req.thread_friction.is_none()),
            ("bearing_friction", req.bearing_friction.is_none()),
        ]
        .iter()
        .filter(|(_, m)| *m)
        .map(|(f, _)| *f)
        .collect();
        let why = format!(
            "needed to look up {} in the friction catalogue; give it, or give {} directly",
            missing.join(" and "),
            missing.join(" and ")
        );
        if req.finish.is_none() {
            problems.push(FieldProblem::invalid("finish", why.clone()));
        }
        if req.lubricant.is_none() {
            problems.push(FieldProblem::invalid("lubricant", why));
        }
    }

    let found: Option<FrictionMatch<'_>> = match (finish, lubricant) {
        (Some(f), Some(l)) => match snapshot.friction_for_joint(&f.id, &l.id, None, &tags) {
            Ok(m) => Some(m),
            Err(e) => {
                // Only a problem when the catalogue values are needed.
                if need_catalogue {
                    problems.extend(crate::app::error::catalogue_problems(&e));
                }
                None
            }
        },
        _ => None,
    };
    let entry = found.map(|m| m.entry);

    let catalogue_ranges = entry.and_then(|e| {
        let t = FrictionRange::new(
            e.thread_friction.min,
            e.thread_friction.max,
            "thread_friction",
        );
        let b = FrictionRange::new(
            e.bearing_friction.min,
            e.bearing_friction.max,
            "bearing_friction",
        );
        match (t, b) {
            (Ok(t), Ok(b)) => Some((t, b)),
            _ => None,
        }
    });
    if need_catalogue && entry.is_some() && catalogue_ranges.is_none() {
        // The catalogue validates the same bounds; refuse rather than guess.
        problems.push(FieldProblem::invalid(
            "lubricant",
            "the catalogue entry for this finish and lubricant holds friction values the \
             engine does not accept",
        ));
    }
    if problems.len() > start {
        return None;
    }

    let (thread, thread_origin) = match (thread_given, entry, catalogue_ranges) {
        (Some(r), _, _) => (r, FrictionOrigin::Request),
        (None, Some(e), Some((t, _))) => (t, origin_of(e)),
        _ => return None,
    };
    let (bearing, bearing_origin) = match (bearing_given, entry, catalogue_ranges) {
        (Some(r), _, _) => (r, FrictionOrigin::Request),
        (None, Some(e), Some((_, b))) => (b, origin_of(e)),
        _ => return None,
    };
    let uses_catalogue = [&thread_origin, &bearing_origin]
        .iter()
        .any(|o| matches!(o, FrictionOrigin::Catalogue { .. }));
    Some(ResolvedFriction {
        thread,
        thread_origin,
        bearing,
        bearing_origin,
        finish: finish.map(|f| f.id.clone()),
        lubricant: lubricant.map(|l| l.id.clone()),
        electroplated: finish.is_some_and(|f| f.electroplated),
        stainless: finish.is_some_and(|f| f.stainless),
        hot_dip_galvanized: finish.is_some_and(|f| f.hot_dip_galvanized()),
        acid_cleaned: finish.is_some_and(|f| f.acid_cleaned()),
        dry: lubricant.is_some_and(|l| l.dry),
        catalogue_ranges,
        scope: found.filter(|_| uses_catalogue).map(|m| FrictionScope {
            joint_tag: m.joint_tag().map(str::to_string),
            reason: m.reason(),
        }),
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::app::ProblemClass;

    fn req() -> SpecRequest {
        SpecRequest {
            thread: "M10".into(),
            property_class: "8.8".into(),
            ..SpecRequest::default()
        }
    }

    fn seed_pair(snap: &Snapshot) -> (String, String, FrictionEntry) {
        let e = snap
            .active_entries()
            .find(|e| e.bearing_surface.is_none())
            .expect("seed has entries")
            .clone();
        (e.finish.clone(), e.lubricant.clone(), e)
    }

    #[test]
    fn catalogue_values_with_provenance() {
        let snap = Snapshot::seed();
        let (finish, lubricant, entry) = seed_pair(&snap);
        let mut r = req();
        r.finish = Some(finish);
        r.lubricant = Some(lubricant);
        let mut problems = Vec::new();
        let f = resolve_friction(&r, &snap, &mut problems).unwrap();
        assert!(problems.is_empty());
        assert_eq!(f.thread.min(), entry.thread_friction.min);
        assert_eq!(f.bearing.max(), entry.bearing_friction.max);
        assert_eq!(
            f.thread_origin,
            FrictionOrigin::Catalogue {
                entry_id: entry.id,
                entry_revision: entry.revision,
                reference: entry.source.clone()
            }
        );
    }

    #[test]
    fn given_values_replace_the_catalogue() {
        let snap = Snapshot::seed();
        let mut r = req();
        r.thread_friction = Some(FrictionInput::Single(0.12));
        r.bearing_friction = Some(FrictionInput::Range {
            min: 0.1,
            max: 0.14,
        });
        let mut problems = Vec::new();
        let f = resolve_friction(&r, &snap, &mut problems).unwrap();
        assert_eq!((f.thread.min(), f.thread.max()), (0.12, 0.12));
        assert_eq!((f.bearing.min(), f.bearing.max()), (0.1, 0.14));
        assert_eq!(f.thread_origin, FrictionOrigin::Request);
        assert_eq!(f.bearing_origin, FrictionOrigin::Request);
    }

    #[test]
    fn one_side_given_other_from_catalogue() {
        let snap = Snapshot::seed();
        let (finish, lubricant, entry) = seed_pair(&snap);
        let mut r = req();
        r.finish = Some(finish);
        r.lubricant = Some(lubricant);
        r.thread_friction = Some(FrictionInput::Single(0.11));
        let mut problems = Vec::new();
        let f = resolve_friction(&r, &snap, &mut problems).unwrap();
        assert_eq!(f.thread_origin, FrictionOrigin::Request);
        assert_eq!(f.bearing.min(), entry.bearing_friction.min);
    }

    #[test]
    fn neither_names_what_is_missing() {
        let snap = Snapshot::seed();
        let mut problems = Vec::new();
        assert!(resolve_friction(&req(), &snap, &mut problems).is_none());
        let fields: Vec<&str> = problems.iter().map(|p| p.field.as_str()).collect();
        assert_eq!(fields, ["finish", "lubricant"]);
        assert!(problems.iter().all(|p| p.class == ProblemClass::Invalid));
        assert!(problems[0]
            .reason
            .contains("thread_friction and bearing_friction"));
    }

    #[test]
    fn unknown_finish_suggests() {
        let snap = Snapshot::seed();
        let (finish, lubricant, _) = seed_pair(&snap);
        let mut r = req();
        r.finish = Some(format!("{finish}x"));
        r.lubricant = Some(lubricant);
        let mut problems = Vec::new();
        assert!(resolve_friction(&r, &snap, &mut problems).is_none());
        assert_eq!(problems.len(), 1);
        assert_eq!(problems[0].class, ProblemClass::Unknown);
        assert_eq!(problems[0].field, "finish");
        assert!(problems[0].suggestions.contains(&finish), "{problems:?}");
    }

    #[test]
    fn bad_given_values_name_the_end() {
        let snap = Snapshot::seed();
        let mut r = req();
        r.thread_friction = Some(FrictionInput::Range { min: 0.2, max: 0.1 });
        r.bearing_friction = Some(FrictionInput::Single(0.9));
        let mut problems = Vec::new();
        assert!(resolve_friction(&r, &snap, &mut problems).is_none());
        let fields: Vec<&str> = problems.iter().map(|p| p.field.as_str()).collect();
        assert_eq!(fields, ["thread_friction.min", "bearing_friction"]);
        assert!(problems.iter().all(|p| p.class == ProblemClass::Invalid));
    }
}
