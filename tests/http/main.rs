//! The one black-box test binary: every test starts the real server on a
//! free loopback port (see `support::TestApp`) and talks HTTP to it.
//! Logs are quiet unless `TEST_LOG` is set (`TEST_LOG=debug cargo test`).

mod support;

mod errors;
mod health;
mod openapi;
mod reference;
mod registry_releases_store;
mod registry_store;
mod revision_keys;

mod answer_cache;
mod auth;
mod batch;
mod batch_setpoints;
mod big_sizes;
mod bolt_spec;
mod bulk_releases;
mod catalogue;
mod catalogue_cli;
mod catalogue_instances;
mod catalogue_specs;
mod catalogue_support;
mod charts;
mod contract;
mod controlled_methods;
mod csv_export;
mod fetch_kept;
mod friction_tests;
mod friction_tests_notes;
mod friction_tests_store;
mod heads_and_sizes;
mod hydrogen;
mod impact;
mod impact_changes;
mod implausible;
mod joint_charts;
mod joint_cli;
mod joint_materials;
mod joint_model;
mod joint_releases;
mod joints;
mod joints_bulk;
mod joints_bulk_cli;
mod kill9;
mod kill9_releases;
mod limits;
mod mqtt;
mod mqtt_outage;
mod outage_freeze;
mod provenance;
mod setpoint_checks;
mod setpoints;
mod spec_cli;
mod specs;
mod specs_support;
mod store;
mod subscriptions;
mod tag_scope;
mod ui;
mod ui_browser;
mod ui_impact;
mod ui_joints;
mod webhook_receiver;
mod webhooks;
