//! `tightspec spec` puts a headline over the window when error checks
//! apply, so they cannot be missed below it.

use std::process::Command;

fn spec(args: &[&str]) -> String {
    let out = Command::new(env!("CARGO_BIN_EXE_tightspec"))
        .arg("spec")
        .arg("--builtin-catalogue")
        .args(args)
        .env_remove("RUST_LOG")
        .output()
        .expect("run tightspec");
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    String::from_utf8_lossy(&out.stdout).into_owned()
}

const M8: [&str; 8] = [
    "--thread",
    "M8",
    "--property-class",
    "8.8",
    "--finish",
    "zinc-electroplated",
    "--lubricant",
    "none",
];

#[test]
fn error_checks_are_announced_before_the_window() {
    // M8 8.8 screwed 12 mm into EN AW-6082: two error checks.
    let mut args = M8.to_vec();
    args.extend([
        "--joint-type",
        "tapped-hole",
        "--clamped-material",
        "aluminium-6082",
        "--engagement-length",
        "12mm",
    ]);
    let text = spec(&args);
    let headline = text
        .find("2 error checks — do not use these values")
        .unwrap_or_else(|| panic!("{text}"));
    let window = text
        .find("Torque      lower")
        .unwrap_or_else(|| panic!("{text}"));
    assert!(headline < window, "{text}");
    assert!(text.contains("surface_pressure_exceeded"), "{text}");
    assert!(text.contains("safety-critical"), "{text}");

    // Without error checks there is no headline.
    let clean = spec(&M8);
    assert!(!clean.contains("do not use these values"), "{clean}");
    assert!(clean.contains("Torque      lower"), "{clean}");
}
