use super::*;

fn args(file: PathBuf) -> EvaluateArgs {
    EvaluateArgs {
        file,
        thread: "M10".into(),
        property_class: Some("8.8".into()),
        finish: None,
        lubricant: None,
        head: None,
        washer: None,
        hole: None,
        bearing_outer: Some("16 mm".into()),
        bearing_inner: Some("10.5 mm".into()),
        thrust_bearing: false,
        units: Units::Si,
        json: false,
    }
}

#[test]
fn evaluates_a_csv_file_and_prints_the_table() {
    let path = std::env::temp_dir().join(format!("calib-cli-{}.csv", std::process::id()));
    std::fs::write(
        &path,
        "clamp_force [kN],total_torque [N·m],thread_torque [N·m]\n25,47.5,21\n25,48,\n",
    )
    .unwrap();
    let out = run(&FrictionCommand::Evaluate(args(path.clone()))).unwrap();
    assert!(out.contains("thread_friction"), "{out}");
    assert!(out.contains("series_too_small"), "{out}");
    // the table numbers the two specimens 1 and 2, not 0 and 1
    let numbers: Vec<&str> = out
        .lines()
        .filter(|l| l.contains("25000.000"))
        .map(|l| l.split_whitespace().next().unwrap_or(""))
        .collect();
    assert_eq!(numbers, ["1", "2"], "{out}");
    let mut json_args = args(path.clone());
    json_args.json = true;
    json_args.units = Units::Us;
    let json = run(&FrictionCommand::Evaluate(json_args)).unwrap();
    let v: serde_json::Value = serde_json::from_str(&json).unwrap();
    assert_eq!(v["specimens"][0]["clamp_force"]["unit"], "lbf");
    assert_eq!(
        v["specimens"][1]["thread_friction"],
        serde_json::Value::Null
    );
    std::fs::write(&path, "clamp_force [kN],total_torque [N·m]\n0,47.5\n").unwrap();
    let err = run(&FrictionCommand::Evaluate(args(path.clone()))).unwrap_err();
    assert!(err.contains("specimens[0].clamp_force"), "{err}");
    let _ = std::fs::remove_file(path);
}
