//! The command line: [`Cli`] and its subcommands ([`Command`]). Each
//! subcommand's own arguments are declared beside its code in `cli/`; the
//! server's settings are `crate::config::Config`.

use clap::{Args, Parser, Subcommand};

use crate::config::Config;

/// `tightspec`: tightening specifications for threaded fasteners.
#[derive(Debug, Parser)]
#[command(name = "tightspec", version, about)]
pub struct Cli {
    #[command(subcommand)]
    pub command: Command,
}

/// What to do.
#[derive(Debug, Subcommand)]
pub enum Command {
    /// Run the HTTP service.
    Serve(Config),
    /// Print the OpenAPI document (the same as `GET /openapi.json`).
    Openapi,
    /// Compute a tightening spec from the shell (table, or `--json`).
    Spec(Box<super::spec::SpecArgs>),
    /// Apply pending database migrations (and seed an empty catalogue).
    Migrate(DatabaseArgs),
    /// Manage API tokens on the configured database.
    Token {
        #[command(flatten)]
        db: DatabaseArgs,
        #[command(subcommand)]
        command: super::token::TokenCommand,
    },
    /// Import or export the friction catalogue.
    Catalogue {
        #[command(flatten)]
        db: DatabaseArgs,
        #[command(subcommand)]
        command: super::catalogue::CatalogueCommand,
    },
    /// The joint registry: list, show, release, approve, withdraw.
    Joint {
        #[command(flatten)]
        db: DatabaseArgs,
        #[command(flatten)]
        joint: super::joint::JointArgs,
    },
    /// Friction tests: evaluate a torque–tension series.
    #[command(subcommand)]
    Friction(super::friction::FrictionCommand),
}

/// The database a command works on.
#[derive(Debug, Clone, Args)]
pub struct DatabaseArgs {
    /// `postgres://…` or `sqlite://path`; default: the embedded SQLite
    /// store under ./data/.
    #[arg(long, env = "DATABASE_URL")]
    pub database_url: Option<String>,
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::config::Limits;

    #[test]
    fn serve_flags_parse() {
        let cli = Cli::try_parse_from([
            "tightspec",
            "serve",
            "--listen",
            "0.0.0.0:9000",
            "--anonymous-reads",
            "false",
        ])
        .expect("parses");
        match cli.command {
            Command::Serve(c) => {
                assert_eq!(c.listen, "0.0.0.0:9000");
                assert!(!c.anonymous_reads);
            }
            other => panic!("expected serve, got {other:?}"),
        }
    }

    #[test]
    fn limit_defaults_match_the_flags() {
        let cli = Cli::try_parse_from(["tightspec", "serve"]).expect("parses");
        let Command::Serve(c) = cli.command else {
            panic!("expected serve");
        };
        let d = Limits::default();
        assert_eq!(c.limits.max_connections, d.max_connections);
        assert_eq!(
            c.limits.max_connections_per_worker,
            d.max_connections_per_worker
        );
        assert_eq!(c.limits.backlog, d.backlog);
        assert_eq!(c.limits.keep_alive_secs, d.keep_alive_secs);
        assert_eq!(
            c.limits.header_read_timeout_secs,
            d.header_read_timeout_secs
        );
        assert_eq!(c.limits.body_read_timeout_secs, d.body_read_timeout_secs);
        assert_eq!(c.limits.request_timeout_secs, d.request_timeout_secs);
        assert_eq!(c.limits.disconnect_timeout_ms, d.disconnect_timeout_ms);
    }

    #[test]
    fn deadlines_of_zero_are_refused() {
        for flag in [
            "--header-read-timeout-secs",
            "--body-read-timeout-secs",
            "--request-timeout-secs",
        ] {
            assert!(Cli::try_parse_from(["tightspec", "serve", flag, "0"]).is_err());
            assert!(Cli::try_parse_from(["tightspec", "serve", flag, "1"]).is_ok());
        }
    }

    #[test]
    fn mqtt_settings_are_off_by_default_and_checked_at_start() {
        let cli = Cli::try_parse_from(["tightspec", "serve"]).expect("parses");
        let Command::Serve(c) = cli.command else {
            panic!("expected serve");
        };
        assert_eq!(c.mqtt.broker, None);
        assert_eq!(c.mqtt.topic_prefix, "tightspec");
        let on = [
            "tightspec",
            "serve",
            "--mqtt-broker",
            "mqtt://127.0.0.1:1883",
        ];
        let Command::Serve(c) = Cli::try_parse_from(on).expect("parses").command else {
            panic!("expected serve");
        };
        assert_eq!(c.mqtt.broker.map(|b| b.port), Some(1883));
        for (flag, bad) in [
            ("--mqtt-broker", "ws://127.0.0.1:1883"),
            ("--mqtt-topic-prefix", "plant/+/line"),
            ("--mqtt-topic-prefix", "plant//line"),
        ] {
            let e = Cli::try_parse_from(["tightspec", "serve", flag, bad])
                .expect_err(bad)
                .to_string();
            assert!(e.contains(flag), "{e}");
        }
    }

    #[test]
    fn clap_definition_is_consistent() {
        use clap::CommandFactory;
        Cli::command().debug_assert();
    }
}
