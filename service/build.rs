//! Rebuild when a migration or the seed catalogue changes: `sqlx::migrate!`
//! embeds `migrations/*` at compile time but does not track new files.
//! Nothing is downloaded or generated here.

fn main() {
    println!("cargo:rerun-if-changed=../migrations");
}
