//! `tightspec joint release`: one joint (`release ID`), or several at
//! once (`release ID ID …`, `release --tag T`) through the bulk release
//! use case: all or nothing, at most 1,000 joints, every refused joint
//! listed.

use std::io::Write;

use serde_json::{json, Value};

use super::joint::{refusal, release_line, CliResult};
use crate::app::releases::bulk::BulkReleaseView;
use crate::app::releases::view::ReleaseView;
use crate::app::App;

/// Who releases, why, and the error checks accepted (`CODE=REASON`).
pub struct Releasing<'a> {
    pub by: &'a str,
    pub reason: &'a str,
    pub accept: &'a [String],
}

/// `--accept CODE=REASON` as the release body's `accept_checks`.
fn accepted(given: &[String]) -> Result<Vec<Value>, String> {
    given
        .iter()
        .map(|a| match a.split_once('=') {
            Some((code, reason)) => Ok(json!({"code": code.trim(), "reason": reason.trim()})),
            None => Err(format!("--accept '{a}': write CODE=REASON")),
        })
        .collect()
}

pub async fn release(
    app: &App,
    as_json: bool,
    ids: &[String],
    tag: Option<&str>,
    who: &Releasing<'_>,
    out: &mut dyn Write,
) -> CliResult {
    let accept = accepted(who.accept)?;
    if let ([id], None) = (ids, tag) {
        let body = json!({"reason": who.reason, "accept_checks": accept});
        let r = app
            .release_joint(who.by, id, &body)
            .await
            .map_err(refusal)?;
        let view = ReleaseView::of(&r, None);
        if as_json {
            writeln!(out, "{}", serde_json::to_string_pretty(&view)?)?;
        } else {
            writeln!(out, "{}", release_line(&view))?;
        }
        return Ok(());
    }
    let body = match tag {
        Some(tag) => json!({"tag": tag, "reason": who.reason, "accept_checks": accept}),
        None => json!({"ids": ids, "reason": who.reason, "accept_checks": accept}),
    };
    let released = app.release_joints(who.by, &body).await.map_err(refusal)?;
    let view = BulkReleaseView::of(&released, app.four_eyes());
    if as_json {
        writeln!(out, "{}", serde_json::to_string_pretty(&view)?)?;
    } else {
        for r in &view.releases {
            writeln!(out, "{}", release_line(r))?;
        }
        writeln!(out, "{} joints, each {}", view.count, view.status)?;
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn accepted_checks_are_code_equals_reason() {
        let got = accepted(&["surface_pressure_exceeded= hardened washer".into()]).unwrap();
        assert_eq!(
            got,
            [json!({"code": "surface_pressure_exceeded", "reason": "hardened washer"})]
        );
        assert!(accepted(&["surface_pressure_exceeded".into()]).is_err());
    }
}
