package main

import (
	"io"

	"github.com/urfave/cli/v2"

	"spanwright/media"
)

func mediaCommand() *cli.Command {
	return &cli.Command{
		Name:        "media",
		Description: "Prints the media catalog as a reach-and-loss table.\n\n" + exitHelp("media"),
		Usage:       "print the media catalog as a reach-and-loss table",
		Flags: []cli.Flag{
			&cli.StringFlag{Name: "rate", Usage: "only applications at this data rate, e.g. 10G"},
			&cli.PathFlag{Name: "catalog", Usage: "a catalog YAML file instead of the embedded one", TakesFile: true},
		},
		Action: func(c *cli.Context) error {
			return runMedia(c.String("catalog"), c.String("rate"), c.App.Writer)
		},
	}
}

func runMedia(catalogPath, rate string, w io.Writer) error {
	cat := media.DefaultCatalog()
	if catalogPath != "" {
		var err error
		if cat, err = media.LoadCatalog(catalogPath); err != nil {
			return err
		}
	}
	var rateGbps float64
	if rate != "" {
		var err error
		if rateGbps, err = cat.ParseRate(rate); err != nil {
			return usageError{err}
		}
	}
	if err := cat.Table(w, rateGbps); err != nil {
		return err
	}
	return cat.ReachTable(w, rateGbps)
}
