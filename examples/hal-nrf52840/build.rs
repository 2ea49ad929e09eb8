//! The nRF52840's memory map (1 MiB of flash, 256 KiB of RAM, no boot loader or radio stack
//! below the application) and the demo design's constants.
include!("../hal-common/build_config.rs");

fn main() {
    configure_and_link(
        "MEMORY {
    FLASH : ORIGIN = 0x00000000, LENGTH = 1024K
    RAM   : ORIGIN = 0x20000000, LENGTH = 256K
}
",
    );
}
