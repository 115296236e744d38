use std::process::ExitCode;

fn main() -> ExitCode {
    match nonet::cli::run(std::env::args_os()) {
        Ok(status) => ExitCode::from(status.code()),
        Err(e) => {
            // `nonet ... | head` closes the pipe early: that is not an error
            if e.chain().any(|c| {
                c.downcast_ref::<std::io::Error>()
                    .is_some_and(|io| io.kind() == std::io::ErrorKind::BrokenPipe)
            }) {
                return ExitCode::SUCCESS;
            }
            eprintln!("error: {e:#}");
            ExitCode::from(nonet::cli::Status::Failure.code())
        }
    }
}
