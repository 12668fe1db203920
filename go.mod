module rollerbed

go 1.26

require gonum.org/v1/gonum v0.17.0

require (
	github.com/BurntSushi/toml v1.6.0 // indirect
	github.com/mjibson/go-dsp v0.0.0-20180508042940-11479a337f12 // indirect
	gonum.org/v1/hdf5 v0.0.0-20210714002203-8c5d23bc6946 // indirect
)
