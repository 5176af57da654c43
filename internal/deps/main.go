package main

import (
	_ "github.com/spf13/pflag"
	_ "github.com/xuri/excelize/v2"
	_ "gonum.org/v1/gonum/integrate"
	_ "gonum.org/v1/gonum/optimize"
	_ "gonum.org/v1/gonum/stat"
	_ "gonum.org/v1/plot"
	_ "gonum.org/v1/plot/vg/vgimg"
)

func main() {}
