//! Configuration from flags and environment (12-factor): every flag of
//! `tightspec serve` has an environment variable of the same meaning.
//!
//! This module holds the service's settings ([`Config`], [`Limits`]) and
//! uses no other module of the crate; the command line that carries them
//! (`crate::cli::Cli`) is declared in `cli/args.rs`.

pub mod mqtt;

use clap::Args;

pub use mqtt::{Broker, Mqtt};

/// Default listen address.
pub const DEFAULT_LISTEN: &str = "127.0.0.1:8080";

/// Default limit for request bodies: 8 MiB, room for a batch of 10,000
/// spec requests of a few hundred bytes each.
pub const DEFAULT_MAX_BODY_BYTES: usize = 8 * 1024 * 1024;

/// Default number of rendered look-up answers kept per route (see
/// `http::specs::answer_cache`); about 5 MB at most for specs.
pub const DEFAULT_ANSWER_CACHE: usize = 1024;

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
    /// The four-eyes rule for joint releases: a release starts as a draft
    /// and becomes active only when a second person with the role
    /// `approver` approves it. Off: a release is active at once.
    #[arg(
        long,
        env = "TIGHTSPEC_FOUR_EYES",
        default_value_t = false,
        action = clap::ArgAction::Set
    )]
    pub four_eyes: bool,
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
    #[command(flatten)]
    pub limits: Limits,
    #[command(flatten)]
    pub webhooks: Webhooks,
    #[command(flatten)]
    pub mqtt: Mqtt,
}

/// Webhook delivery from the outbox. Any number of instances may deliver:
/// each delivery is claimed by one of them.
#[derive(Debug, Clone, Args)]
pub struct Webhooks {
    /// Whether this instance delivers webhooks (a worker beside the server).
    #[arg(
        long = "webhook-delivery",
        env = "TIGHTSPEC_WEBHOOK_DELIVERY",
        default_value_t = true,
        action = clap::ArgAction::Set
    )]
    pub delivery: bool,
    /// Milliseconds between the worker's looks for due deliveries.
    #[arg(
        long = "webhook-interval-ms",
        env = "TIGHTSPEC_WEBHOOK_INTERVAL_MS",
        default_value_t = 1000,
        value_parser = clap::value_parser!(u64).range(10..=600_000)
    )]
    pub interval_ms: u64,
    /// Seconds one delivery attempt may take (connect, send, answer); a
    /// slower target counts as a failed attempt.
    #[arg(
        long = "webhook-timeout-secs",
        env = "TIGHTSPEC_WEBHOOK_TIMEOUT_SECS",
        default_value_t = 10,
        value_parser = clap::value_parser!(u64).range(1..=120)
    )]
    pub timeout_secs: u64,
    /// Delivery attempts in flight at once on this instance.
    #[arg(
        long = "webhook-concurrency",
        env = "TIGHTSPEC_WEBHOOK_CONCURRENCY",
        default_value_t = 16,
        value_parser = clap::value_parser!(u64).range(1..=256)
    )]
    pub concurrency: u64,
}

impl Default for Webhooks {
    fn default() -> Self {
        Self {
            delivery: true,
            interval_ms: 1000,
            timeout_secs: 10,
            concurrency: 16,
        }
    }
}

/// Connection and time limits of the HTTP server (request hardening). The
/// connection caps, backlog, keep-alive, header and disconnect timeouts are
/// actix-web's own server settings; the body-read and request deadlines
/// are enforced by `http::deadline`.
#[derive(Debug, Clone, Args)]
pub struct Limits {
    /// Open connections across all workers; each worker gets its share
    /// (rounded up). Connections beyond it wait in the listen backlog.
    /// Keep it below the process's open-file limit (`ulimit -n`).
    #[arg(long, env = "TIGHTSPEC_MAX_CONNECTIONS", default_value_t = 4096)]
    pub max_connections: usize,
    /// Open connections per worker thread (the smaller of this and the
    /// worker's share of `--max-connections` applies).
    #[arg(
        long,
        env = "TIGHTSPEC_MAX_CONNECTIONS_PER_WORKER",
        default_value_t = 1024
    )]
    pub max_connections_per_worker: usize,
    /// Pending connections the kernel queues before they are accepted.
    #[arg(long, env = "TIGHTSPEC_BACKLOG", default_value_t = 1024)]
    pub backlog: u32,
    /// Seconds an idle keep-alive connection stays open (0: no keep-alive).
    #[arg(long, env = "TIGHTSPEC_KEEP_ALIVE_SECS", default_value_t = 5)]
    pub keep_alive_secs: u64,
    /// Seconds a client gets to send the request line and headers (408 and
    /// closed after); a connection that sends nothing is closed after it.
    #[arg(
        long,
        env = "TIGHTSPEC_HEADER_READ_TIMEOUT_SECS",
        default_value_t = 10,
        value_parser = clap::value_parser!(u64).range(1..)
    )]
    pub header_read_timeout_secs: u64,
    /// Seconds a client gets to send the whole request body, counted from
    /// the end of the headers (408 problem and the connection closed after).
    #[arg(
        long,
        env = "TIGHTSPEC_BODY_READ_TIMEOUT_SECS",
        default_value_t = 20,
        value_parser = clap::value_parser!(u64).range(1..)
    )]
    pub body_read_timeout_secs: u64,
    /// Seconds a request may take until its answer starts, body read
    /// included (503 problem after; a streamed batch answer is not cut).
    #[arg(
        long,
        env = "TIGHTSPEC_REQUEST_TIMEOUT_SECS",
        default_value_t = 30,
        value_parser = clap::value_parser!(u64).range(1..)
    )]
    pub request_timeout_secs: u64,
    /// Milliseconds the server waits for a client to acknowledge the close
    /// of a connection before dropping it.
    #[arg(long, env = "TIGHTSPEC_DISCONNECT_TIMEOUT_MS", default_value_t = 1000)]
    pub disconnect_timeout_ms: u64,
}

impl Default for Limits {
    fn default() -> Self {
        Self {
            max_connections: 4096,
            max_connections_per_worker: 1024,
            backlog: 1024,
            keep_alive_secs: 5,
            header_read_timeout_secs: 10,
            body_read_timeout_secs: 20,
            request_timeout_secs: 30,
            disconnect_timeout_ms: 1000,
        }
    }
}

impl Limits {
    /// Connections one worker may hold with `workers` workers.
    pub fn per_worker(&self, workers: usize) -> usize {
        let share = self.max_connections.div_ceil(workers.max(1));
        share.min(self.max_connections_per_worker).max(1)
    }
}

impl Config {
    /// Settings for tests and embedding: a free port on loopback, no
    /// database URL, anonymous reads, no webhook worker (tests that need
    /// one turn it on, or drive delivery themselves), no MQTT publishing.
    pub fn local() -> Self {
        Self {
            listen: "127.0.0.1:0".to_string(),
            database_url: None,
            anonymous_reads: true,
            four_eyes: false,
            max_body_bytes: DEFAULT_MAX_BODY_BYTES,
            shutdown_timeout_secs: 5,
            workers: 2,
            answer_cache_entries: DEFAULT_ANSWER_CACHE,
            limits: Limits::default(),
            webhooks: Webhooks {
                delivery: false,
                ..Webhooks::default()
            },
            mqtt: Mqtt::default(),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn connections_are_shared_among_workers() {
        let l = Limits::default();
        assert_eq!(l.per_worker(2), 1024);
        assert_eq!(l.per_worker(8), 512);
        let small = Limits {
            max_connections: 5,
            ..Limits::default()
        };
        assert_eq!(small.per_worker(2), 3);
        assert_eq!(small.per_worker(0), 5);
    }
}
