//! Why a grade does not apply to a thread, with the grades that would.

use uom::si::length::millimeter;

use super::super::thread::{ThreadForm, ThreadGeometry};
use super::super::EngineError;
use super::large::{metric_counterpart, ABOVE_M39_STAINLESS, ABOVE_M39_STEEL};
use super::{property_classes, GradeFamily, GradeInfo, FIELD};

/// Largest nominal diameter of ISO 898-1 and ISO 3506-1 (M39; scope of
/// both standards, recalled from memory).
const ISO_LIMIT_MM: f64 = 39.0;

fn above_iso_limit(thread: &ThreadGeometry) -> bool {
    thread.form == ThreadForm::IsoMetric
        && thread.nominal_diameter.get::<millimeter>() > ISO_LIMIT_MM + 1e-3
}

fn ids(list: &[&str]) -> Vec<String> {
    list.iter().map(|s| s.to_string()).collect()
}

/// The grade's standard is written for the other thread form.
pub(super) fn wrong_form(grade: &GradeInfo, thread: &ThreadGeometry) -> EngineError {
    let (reason, suggestions) = match grade.family.thread_form() {
        ThreadForm::IsoMetric => (
            format!(
                "{} ({}) applies to ISO metric threads, not to {}",
                grade.id, grade.standard, thread.designation
            ),
            ids(&["sae-j429-5", "sae-j429-8", "astm-a574"]),
        ),
        ThreadForm::Unified => match metric_counterpart(grade.id) {
            Some(metric) => (
                format!(
                    "{} ({}) applies to Unified inch threads, not to {}; the metric edition of the standard is {metric}",
                    grade.name, grade.standard, thread.designation
                ),
                vec![metric.to_string()],
            ),
            None if above_iso_limit(thread) => (
                format!(
                    "{} ({}) applies to Unified inch threads, not to {}",
                    grade.name, grade.standard, thread.designation
                ),
                ids(ABOVE_M39_STEEL),
            ),
            None => (
                format!(
                    "{} ({}) applies to Unified inch threads, not to {}",
                    grade.name, grade.standard, thread.designation
                ),
                ids(&["8.8", "10.9", "12.9"]),
            ),
        },
    };
    EngineError::Invalid {
        field: FIELD.into(),
        reason,
        suggestions,
    }
}

/// The thread's size lies outside every size range of the grade.
pub(super) fn outside_sizes(grade: &GradeInfo, thread: &ThreadGeometry) -> EngineError {
    let ranges: Vec<&str> = grade.size_ranges.iter().map(|r| r.label).collect();
    let mut reason = format!(
        "{} is defined for {} only ({}); {} is outside",
        grade.name,
        ranges.join(", "),
        grade.standard,
        thread.designation
    );
    let beyond = match grade.family {
        GradeFamily::Iso898 if above_iso_limit(thread) => Some(("ISO 898-1", ABOVE_M39_STEEL)),
        GradeFamily::Iso3506 if above_iso_limit(thread) => {
            Some(("ISO 3506-1", ABOVE_M39_STAINLESS))
        }
        _ => None,
    };
    let suggestions = match beyond {
        Some((standard, larger)) => {
            reason.push_str(&format!(
                ": {standard} covers metric bolts to M39 only (scope, recalled from memory); for larger metric bolts \
                 ASTM A193/A193M and A320/A320M give strengths ({})",
                larger.join(", ")
            ));
            ids(larger)
        }
        None => {
            let d = thread.nominal_diameter;
            property_classes()
                .iter()
                .filter(|g| g.family == grade.family && g.size_ranges.iter().any(|r| r.covers(d)))
                .map(|g| g.id.to_string())
                .collect()
        }
    };
    EngineError::Invalid {
        field: FIELD.into(),
        reason,
        suggestions,
    }
}
