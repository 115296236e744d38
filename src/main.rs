use std::process::ExitCode;

fn main() -> ExitCode {
    ExitCode::from(nonet::cli::main(std::env::args_os()).code())
}
