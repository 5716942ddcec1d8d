//! Command-line entry points. `main.rs` parses [`Cli`] (`args.rs`) and
//! calls [`run`]; each subcommand lives in its own module.

mod args;
pub mod catalogue;
pub mod friction;
pub mod joint;
pub mod joint_release;
pub mod openapi;
pub mod spec;
pub mod token;

use std::io::Write;
use std::process::ExitCode;

use crate::startup::{init_logging, Application};
pub use args::{Cli, Command, DatabaseArgs};

/// Runs one command; errors are printed to stderr with exit code 1.
pub async fn run(command: Command) -> ExitCode {
    let outcome: Result<(), String> = match command {
        Command::Serve(config) => {
            init_logging();
            match Application::build(config).await {
                Ok(app) => app.run_until_stopped().await.map_err(|e| e.to_string()),
                Err(e) => Err(e.to_string()),
            }
        }
        Command::Openapi => openapi::run().and_then(|doc| print(&doc)),
        Command::Spec(args) => spec::run(&args).await.and_then(|text| print(&text)),
        Command::Migrate(db) => {
            let mut out = std::io::stdout();
            catalogue::migrate(db.database_url.as_deref(), &mut out)
                .await
                .map_err(|e| e.to_string())
        }
        Command::Token { db, command } => {
            let mut out = std::io::stdout();
            token::run(&command, db.database_url.as_deref(), &mut out)
                .await
                .map_err(|e| e.to_string())
        }
        Command::Catalogue { db, command } => {
            let mut out = std::io::stdout();
            catalogue::run(&command, db.database_url.as_deref(), &mut out)
                .await
                .map_err(|e| e.to_string())
        }
        Command::Joint { db, joint } => {
            let mut out = std::io::stdout();
            joint::run(&joint, db.database_url.as_deref(), &mut out)
                .await
                .map_err(|e| e.to_string())
        }
        Command::Friction(command) => friction::run(&command).and_then(|text| print(&text)),
    };
    match outcome {
        Ok(()) => ExitCode::SUCCESS,
        Err(message) => {
            eprintln!("tightspec: {message}");
            ExitCode::FAILURE
        }
    }
}

fn print(text: &str) -> Result<(), String> {
    let mut out = std::io::stdout().lock();
    out.write_all(text.as_bytes())
        .and_then(|_| out.flush())
        .map_err(|e| e.to_string())
}
