// Package figure renders the figures of an experiment as PNG images from
// plain inputs: maps of fields on the (x, y) plane with a colour bar,
// several maps side by side on one colour scale, arrows over contours,
// log–log spectra, time series against days, and a time series with its
// histogram beside it. Axes are in km and days and colour bars carry units.
//
// The package depends on no other package of the module but palette (its
// colour scales, contours and grid painter); it draws with
// gonum.org/v1/plot and leaves that package's defaults alone. Every figure
// type has a Draw method returning the image at a size given in pixels;
// WritePNG and PNG encode it.
package figure
