//! Configuration from flags and environment (12-factor): every flag of
//! `tightspec serve` has an environment variable of the same meaning.
//!
//! Subcommands: `serve`, `openapi`; other modules add theirs (`spec`,
//! `token`, `catalogue`, `migrate`, `friction`) as variants of [`Command`]
//! dispatched in `main.rs`.

use clap::{Args, Parser, Subcommand};

/// Default listen address.
pub const DEFAULT_LISTEN: &str = "127.0.0.1:8080";

/// Default limit for request bodies: 8 MiB, room for a batch of 10,000
/// spec requests of a few hundred bytes each.
pub const DEFAULT_MAX_BODY_BYTES: usize = 8 * 1024 * 1024;

/// Default number of rendered look-up answers kept per route (see
/// `http::specs::answer_cache`); about 5 MB at most for specs.
pub const DEFAULT_ANSWER_CACHE: usize = 1024;

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
    Spec(Box<crate::cli::spec::SpecArgs>),
    /// Apply pending database migrations (and seed an empty catalogue).
    Migrate(DatabaseArgs),
    /// Manage API tokens on the configured database.
    Token {
        #[command(flatten)]
        db: DatabaseArgs,
        #[command(subcommand)]
        command: crate::cli::token::TokenCommand,
    },
    /// Import or export the friction catalogue.
    Catalogue {
        #[command(flatten)]
        db: DatabaseArgs,
        #[command(subcommand)]
        command: crate::cli::catalogue::CatalogueCommand,
    },
    /// Friction tests: evaluate a torque–tension series.
    #[command(subcommand)]
    Friction(crate::cli::friction::FrictionCommand),
}

/// The database a command works on.
#[derive(Debug, Clone, Args)]
pub struct DatabaseArgs {
    /// `postgres://…` or `sqlite://path`; default: the embedded SQLite
    /// store under ./data/.
    #[arg(long, env = "DATABASE_URL")]
    pub database_url: Option<String>,
}

/// Settings of the HTTP service.
#[derive(Debug, Clone, Args)]
pub struct Config {
    /// Address to listen on; port 0 picks a free port.
    #[arg(long, env = "TIGHTSPEC_LISTEN", default_value = DEFAULT_LISTEN)]
    pub listen: String,
    /// Catalogue database: `postgres://…` or `sqlite://path`. Without it
    /// the embedded SQLite store under ./data/ is used.
    #[arg(long, env = "DATABASE_URL")]
    pub database_url: Option<String>,
    /// Whether reads need no token.
    #[arg(
        long,
        env = "TIGHTSPEC_ANONYMOUS_READS",
        default_value_t = true,
        action = clap::ArgAction::Set
    )]
    pub anonymous_reads: bool,
    /// Largest accepted request body in bytes (larger bodies get 413).
    #[arg(long, env = "TIGHTSPEC_MAX_BODY_BYTES", default_value_t = DEFAULT_MAX_BODY_BYTES)]
    pub max_body_bytes: usize,
    /// Seconds in-flight requests get to finish after SIGTERM/SIGINT.
    #[arg(long, env = "TIGHTSPEC_SHUTDOWN_TIMEOUT", default_value_t = 30)]
    pub shutdown_timeout_secs: u64,
    /// Worker threads (0: one per CPU core).
    #[arg(long, env = "TIGHTSPEC_WORKERS", default_value_t = 0)]
    pub workers: usize,
    /// Rendered answers to GET spec and setpoint look-ups kept per route
    /// for repeated queries (about 5 KB each; 0 keeps none).
    #[arg(long, env = "TIGHTSPEC_ANSWER_CACHE_ENTRIES", default_value_t = DEFAULT_ANSWER_CACHE)]
    pub answer_cache_entries: usize,
}

impl Config {
    /// Settings for tests and embedding: a free port on loopback, no
    /// database URL, anonymous reads.
    pub fn local() -> Self {
        Self {
            listen: "127.0.0.1:0".to_string(),
            database_url: None,
            anonymous_reads: true,
            max_body_bytes: DEFAULT_MAX_BODY_BYTES,
            shutdown_timeout_secs: 5,
            workers: 2,
            answer_cache_entries: DEFAULT_ANSWER_CACHE,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

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
    fn clap_definition_is_consistent() {
        use clap::CommandFactory;
        Cli::command().debug_assert();
    }
}
