//go:build linux

package main

import (
	"os"
	"syscall"
	"unsafe"
)

// isTTY reports whether f is a terminal: whether its terminal settings
// can be read (the TCGETS request of ioctl(2), which fails with ENOTTY
// on any other file, /dev/null included).
func isTTY(f *os.File) bool {
	var t syscall.Termios
	_, _, errno := syscall.Syscall(syscall.SYS_IOCTL, f.Fd(), uintptr(syscall.TCGETS), uintptr(unsafe.Pointer(&t)))
	return errno == 0
}
