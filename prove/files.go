package prove

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"fmt"

	"avoidcert/certify"
	"avoidcert/internal/atomicfile"
	"avoidcert/internal/input"
)

// Load reads a certificate file: a regular file within the certificate
// size limit (internal/input; anything else is refused at once, a missing
// file matching fs.ErrNotExist). It does not check it: pass the result to
// Recheck before reading a verdict from it.
func Load(ctx context.Context, path string) (*certify.Certificate, error) {
	data, err := input.ReadFile(ctx, path, input.Certificate)
	if err != nil {
		return nil, err
	}
	c, err := certify.Read(bytes.NewReader(data))
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
