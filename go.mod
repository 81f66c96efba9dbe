module avoidcert

go 1.26.8

require (
	github.com/BurntSushi/toml v1.6.0
	github.com/rogpeppe/go-internal v1.16.0
	gonum.org/v1/gonum v0.17.0
)

require (
	golang.org/x/sys v0.30.0 // indirect
	golang.org/x/tools v0.30.0 // indirect
)
