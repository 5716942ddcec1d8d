//! Catalogue items: finishes, lubricants and the friction entries that
//! join them. Plain data, no I/O.

use serde::{Deserialize, Serialize};
use utoipa::ToSchema;

/// Lowest and highest friction coefficient the catalogue accepts. Real
/// steel joints lie between about 0.04 (solid lubricants) and 0.5 (dry
/// stainless); VDI 2230 Part 1 Table A5 spans classes A (0.04–0.10) to
/// E (≥ 0.30). The outer limits 0.02 and 0.6 are the plausibility bounds
/// fixed for this catalogue (common practice: anything outside is a typing
/// error, not a friction value).
pub const FRICTION_MIN: f64 = 0.02;
pub const FRICTION_MAX: f64 = 0.6;

/// Whether a catalogue item may be used for new specifications. Nothing is
/// ever hard-deleted: a retired item stays in history and in past revisions.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize, ToSchema)]
#[serde(rename_all = "lowercase")]
pub enum Status {
    Active,
    Retired,
}

impl Status {
    pub fn as_str(self) -> &'static str {
        match self {
            Status::Active => "active",
            Status::Retired => "retired",
        }
    }

    pub fn is_active(self) -> bool {
        self == Status::Active
    }
}

/// A surface coating or condition of the fastener (and usually its mating
/// nut), e.g. `zinc-electroplated`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct Finish {
    /// Slug, lower case letters, digits and hyphens: `zinc-electroplated`.
    pub id: String,
    pub name: String,
    /// Electroplated coatings carry a hydrogen-embrittlement caution for
    /// high-strength classes (ISO 4042).
    pub electroplated: bool,
    /// Austenitic stainless surfaces, prone to galling when dry.
    pub stainless: bool,
    pub notes: String,
    pub status: Status,
    /// Catalogue revision of this item's last change.
    pub revision: i64,
}

impl Finish {
    /// Hot-dip galvanized (ISO 10684). The catalogue has no process field:
    /// the finish is recognised by its id or name ("hot-dip", "hot dip",
    /// or "galvanized" without "electro": electrogalvanizing is plating).
    pub fn hot_dip_galvanized(&self) -> bool {
        let text = format!("{} {}", self.id, self.name).to_lowercase();
        text.contains("hot-dip")
            || text.contains("hot dip")
            || (text.contains("galvani") && !text.contains("electro"))
    }

    /// Phosphated, pickled or otherwise acid-cleaned before or during
    /// coating, recognised by id or name ("phosphat", "pickl", "acid";
    /// not "acid-free" or "acid free").
    /// Hot-dip galvanizing pickles too, but ISO 10684 excludes the classes
    /// concerned altogether; that check is [`Finish::hot_dip_galvanized`].
    pub fn acid_cleaned(&self) -> bool {
        let text = format!("{} {}", self.id, self.name)
            .to_lowercase()
            .replace("acid-free", "")
            .replace("acid free", "");
        ["phosphat", "pickl", "acid"]
            .iter()
            .any(|w| text.contains(w))
    }
}

/// A lubricant applied at assembly (or the delivered state), e.g. `mos2-paste`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct Lubricant {
    pub id: String,
    pub name: String,
    /// True for "none / as delivered": no lubricant added at assembly.
    pub dry: bool,
    pub notes: String,
    pub status: Status,
    /// Catalogue revision of this item's last change.
    pub revision: i64,
}

/// A friction-coefficient range as the catalogue tabulates it (named
/// `FrictionRange` on the wire), validated: both ends within
/// [`FRICTION_MIN`, `FRICTION_MAX`], finite, and `min <= max`.
/// Build one with [`TabulatedFriction::new`]; deserialising checks the same.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, ToSchema)]
#[serde(try_from = "RangeInput")]
#[schema(
    as = FrictionRange,
    description = "A friction-coefficient range, validated: both ends within\n[`FRICTION_MIN`, `FRICTION_MAX`], finite, and `min <= max`.\nBuild one with [`FrictionRange::new`]; deserialising checks the same."
)]
pub struct TabulatedFriction {
    pub min: f64,
    pub max: f64,
}

/// An unchecked range as a client or file gives it.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct RangeInput {
    pub min: f64,
    pub max: f64,
}

impl TabulatedFriction {
    /// Checks a range; on failure returns every problem as `(sub-field, reason)`
    /// where the sub-field is `min`, `max` or empty for the pair.
    pub fn new(min: f64, max: f64) -> Result<Self, Vec<(&'static str, String)>> {
        let mut problems = Vec::new();
        for (name, v) in [("min", min), ("max", max)] {
            if !v.is_finite() {
                problems.push((name, "must be a finite number".to_string()));
            } else if !(FRICTION_MIN..=FRICTION_MAX).contains(&v) {
                problems.push((
                    name,
                    format!(
                        "friction coefficient {v} is outside the plausible range \
                         {FRICTION_MIN}–{FRICTION_MAX}"
                    ),
                ));
            }
        }
        if min.is_finite() && max.is_finite() && min > max {
            problems.push(("min", format!("min ({min}) is greater than max ({max})")));
        }
        if problems.is_empty() {
            Ok(Self { min, max })
        } else {
            Err(problems)
        }
    }

    pub fn mid(&self) -> f64 {
        (self.min + self.max) / 2.0
    }
}

impl TryFrom<RangeInput> for TabulatedFriction {
    type Error = String;
    fn try_from(raw: RangeInput) -> Result<Self, String> {
        TabulatedFriction::new(raw.min, raw.max).map_err(|p| {
            p.into_iter()
                .map(|(f, r)| format!("{f}: {r}"))
                .collect::<Vec<_>>()
                .join("; ")
        })
    }
}

impl From<TabulatedFriction> for RangeInput {
    fn from(r: TabulatedFriction) -> Self {
        RangeInput {
            min: r.min,
            max: r.max,
        }
    }
}

/// Friction for one combination of finish and lubricant (optionally for a
/// named bearing-surface condition): thread friction μ_G, bearing (head or
/// nut) friction μ_K, optionally a measured total friction μ_tot.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct FrictionEntry {
    pub id: i64,
    /// Finish id (slug).
    pub finish: String,
    /// Lubricant id (slug).
    pub lubricant: String,
    /// Condition of the mating/bearing surface when the entry applies to a
    /// particular one (e.g. `hardened-steel-washer`); absent means "any".
    pub bearing_surface: Option<String>,
    /// The joint tag this entry is limited to (e.g. one part family): it
    /// applies only to joints carrying that tag, and there it wins over the
    /// generic entry for the same finish and lubricant. Absent: generic.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub joint_tag: Option<String>,
    pub thread_friction: TabulatedFriction,
    pub bearing_friction: TabulatedFriction,
    pub total_friction: Option<TabulatedFriction>,
    /// Where the values come from: a published table, a handbook, or a test
    /// series id.
    pub source: String,
    pub notes: String,
    pub status: Status,
    /// Catalogue revision of this entry's last change.
    pub revision: i64,
}

impl FrictionEntry {
    /// The key that at most one active entry may have: finish, lubricant,
    /// bearing surface and joint tag.
    pub fn key(&self) -> (&str, &str, Option<&str>, Option<&str>) {
        (
            self.finish.as_str(),
            self.lubricant.as_str(),
            self.bearing_surface.as_deref(),
            self.joint_tag.as_deref(),
        )
    }

    /// Strong entity tag for optimistic concurrency: changes whenever the
    /// entry changes (its revision is that of its last change).
    pub fn etag(&self) -> String {
        format!("\"entry-{}-r{}\"", self.id, self.revision)
    }
}

/// Entity tag of a finish or lubricant (same scheme as entries).
pub fn item_etag(kind: &str, id: &str, revision: i64) -> String {
    format!("\"{kind}-{id}-r{revision}\"")
}

/// Reads an `If-Match` value produced by [`FrictionEntry::etag`] or
/// [`item_etag`] and returns the revision it names, if it is one of ours.
pub fn revision_from_etag(tag: &str) -> Option<i64> {
    let t = tag.trim();
    let t = t.strip_prefix("W/").unwrap_or(t);
    let t = t.strip_prefix('"')?.strip_suffix('"')?;
    let (_, rev) = t.rsplit_once("-r")?;
    rev.parse().ok()
}

/// Longest joint tag an entry may be limited to, in characters (the
/// registry's longest tag).
pub const JOINT_TAG_MAX: usize = 64;

/// Why `tag` cannot scope a friction entry, if it cannot: a joint tag is
/// 1–[`JOINT_TAG_MAX`] characters, not blank, without control characters
/// (the registry's rule for a joint's tags).
pub fn joint_tag_problem(tag: &str) -> Option<String> {
    let n = tag.chars().count();
    if tag.trim().is_empty() || n > JOINT_TAG_MAX {
        Some(format!(
            "a joint tag has 1 to {JOINT_TAG_MAX} characters and is not blank ({n} given)"
        ))
    } else if tag.chars().any(char::is_control) {
        Some("a joint tag may not hold control characters".into())
    } else {
        None
    }
}

/// True when `s` is a valid catalogue slug: 1–64 of `a-z`, `0-9`, `-`,
/// starting with a letter or digit.
pub fn is_slug(s: &str) -> bool {
    !s.is_empty()
        && s.len() <= 64
        && !s.starts_with('-')
        && s.bytes()
            .all(|b| b.is_ascii_lowercase() || b.is_ascii_digit() || b == b'-')
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn range_checks_bounds_and_order() {
        assert!(TabulatedFriction::new(0.08, 0.16).is_ok());
        assert!(TabulatedFriction::new(0.02, 0.6).is_ok());
        let e = TabulatedFriction::new(0.7, 0.01).unwrap_err();
        assert_eq!(e.len(), 3, "{e:?}");
        assert!(TabulatedFriction::new(f64::NAN, 0.1).is_err());
        assert!(TabulatedFriction::new(0.2, 0.1).is_err());
    }

    #[test]
    fn range_deserialisation_validates() {
        let ok: TabulatedFriction = serde_json::from_str(r#"{"min":0.1,"max":0.2}"#).unwrap();
        assert_eq!(ok.max, 0.2);
        assert!(serde_json::from_str::<TabulatedFriction>(r#"{"min":0.3,"max":0.2}"#).is_err());
    }

    #[test]
    fn coating_process_recognised_by_id_or_name() {
        let finish = |id: &str, name: &str| Finish {
            id: id.to_string(),
            name: name.to_string(),
            electroplated: false,
            stainless: false,
            notes: String::new(),
            status: Status::Active,
            revision: 1,
        };
        assert!(finish("hot-dip-galvanized", "Hot-dip galvanized").hot_dip_galvanized());
        assert!(finish("hdg", "Galvanized (zinc bath)").hot_dip_galvanized());
        // electrogalvanizing is plating, not a zinc bath
        assert!(!finish("electrogalvanized", "Electrogalvanized").hot_dip_galvanized());
        assert!(finish("zinc-phosphate", "Zinc phosphate").acid_cleaned());
        assert!(finish("pickled", "Pickled and oiled").acid_cleaned());
        assert!(!finish("zinc-flake", "Zinc flake, acid-free process").acid_cleaned());
        assert!(!finish("plain", "Plain").acid_cleaned());
    }

    #[test]
    fn etag_round_trip() {
        let tag = item_etag("finish", "zinc-nickel", 7);
        assert_eq!(revision_from_etag(&tag), Some(7));
        assert_eq!(revision_from_etag("\"entry-3-r12\""), Some(12));
        assert_eq!(revision_from_etag("W/\"entry-3-r12\""), Some(12));
        assert_eq!(revision_from_etag("entry-3-r12"), None);
        assert_eq!(revision_from_etag("\"xyz\""), None);
    }

    #[test]
    fn slugs() {
        assert!(is_slug("zinc-flake-lubricated"));
        assert!(!is_slug("Zinc"));
        assert!(!is_slug(""));
        assert!(!is_slug("-a"));
        assert!(!is_slug("a b"));
    }
}
