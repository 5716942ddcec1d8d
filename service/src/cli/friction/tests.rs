use super::*;
use crate::app::friction_tests::csv_series::specimens_from_csv;

#[test]
fn csv_columns_carry_their_units() {
    let text = "clamp_force [kN],total_torque [N·m],thread_torque [N·m]\n25,47.5,21\n25,48,\n";
    let s = specimens_from_csv(text).unwrap();
    assert_eq!(s.len(), 2);
    assert_eq!(s[0].clamp_force.as_ref().unwrap().unit, "kN");
    assert_eq!(s[0].thread_torque.as_ref().unwrap().value, 21.0);
    assert!(s[1].thread_torque.is_none());
}

#[test]
fn csv_without_units_or_with_unknown_columns_is_refused() {
    assert!(specimens_from_csv("clamp_force,total_torque\n1,2\n")
        .unwrap_err()
        .contains("unit"));
    assert!(specimens_from_csv("clamp_force [kN],torque [N·m]\n1,2\n")
        .unwrap_err()
        .contains("unknown"));
    assert!(
        specimens_from_csv("clamp_force [kN],total_torque [N·m]\n1,x\n")
            .unwrap_err()
            .contains("specimens[0]")
    );
}

#[test]
fn quantity_text_splits_number_and_unit() {
    let q = quantity_text("16.5 mm", "--bearing-outer").unwrap();
    assert_eq!((q.value, q.unit.as_ref()), (16.5, "mm"));
    assert!(quantity_text("16", "--bearing-outer").is_err());
}
