//! The `tightspec` binary: parses the command line and hands over.

use std::process::ExitCode;

use clap::Parser;

#[tokio::main]
async fn main() -> ExitCode {
    let cli = tightspec::cli::Cli::parse();
    tightspec::cli::run(cli.command).await
}
