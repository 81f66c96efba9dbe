package prove

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"os"

	"avoidcert/certify"
	"avoidcert/internal/atomicfile"
)

// Load reads a certificate file. It does not check it: pass the result to
// Recheck before reading a verdict from it.
func Load(path string) (*certify.Certificate, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	c, err := certify.Read(f)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return c, nil
}

// Save writes a certificate file atomically, through the project's one
// atomic writer (it never replaces a device, a FIFO or a folder).
func Save(path string, c *certify.Certificate) error {
	data, err := certify.Marshal(c)
	if err != nil {
		return err
	}
	return atomicfile.WriteFile(path, data, 0o644)
}

// Digest returns the SHA-256 of the certificate's file, in hex: the digest
// of the bytes Save writes.
func Digest(c *certify.Certificate) (string, error) {
	data, err := certify.Marshal(c)
	if err != nil {
		return "", err
	}
	sum := sha256.Sum256(data)
	return hex.EncodeToString(sum[:]), nil
}
