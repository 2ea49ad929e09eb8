//! The RP2040's memory map (2 MiB of QSPI flash behind the 256-byte second-stage boot loader,
//! 256 KiB of SRAM) and the demo design's constants.
include!("../hal-common/build_config.rs");

fn main() {
    configure_and_link(
        "MEMORY {
    BOOT2 : ORIGIN = 0x10000000, LENGTH = 0x100
    FLASH : ORIGIN = 0x10000100, LENGTH = 2048K - 0x100
    RAM   : ORIGIN = 0x20000000, LENGTH = 256K
}
EXTERN(BOOT2_FIRMWARE)
SECTIONS {
    .boot2 ORIGIN(BOOT2) : { KEEP(*(.boot2)); } > BOOT2
} INSERT BEFORE .text;
",
    );
}
