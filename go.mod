module rollerbed

go 1.26

require (
	github.com/BurntSushi/toml v1.6.0
	github.com/mjibson/go-dsp v0.0.0-20180508042940-11479a337f12
	gonum.org/v1/gonum v0.17.0
)
