//go:build !linux

package main

import "os"

// isTTY is true elsewhere: there isTerminal goes by the character device
// alone.
func isTTY(*os.File) bool { return true }
