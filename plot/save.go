package plot

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"
)

// DPI is the resolution of PNG output: a figure w points wide is
// round(w·DPI/72) pixels wide.
const DPI = 96

// Formats written by Write and Save.
const (
	SVG = "svg"
	PNG = "png"
)

// ErrFormat means an image format (or file extension) that Write and Save
// do not write.
var ErrFormat = errors.New("plot: unsupported image format (want svg or png)")

// FormatOf returns the format named by the extension of path, SVG or PNG,
// ignoring case. It returns an error wrapping ErrFormat for any other
// extension.
func FormatOf(path string) (string, error) {
	ext := strings.ToLower(strings.TrimPrefix(filepath.Ext(path), "."))
	switch ext {
	case SVG, PNG:
		return ext, nil
	}
	return "", fmt.Errorf("%w: %q", ErrFormat, path)
}

// Write draws f at width × height and writes it to w in format (SVG or
// PNG). A zero width and height take f's natural size; when only one of
// them is zero, it follows the other in the natural proportions. The output is
// deterministic. SVG text names the Liberation Sans font without embedding
// it. It returns an error wrapping ErrFormat for an unknown format, and any
// error of w.
func Write(w io.Writer, f *Figure, format string, width, height vg.Length) error {
	switch {
	case width <= 0 && height <= 0:
		width, height = f.Width, f.Height
	case height <= 0 && f.Width > 0:
		height = f.Height * width / f.Width
	case width <= 0 && f.Height > 0:
		width = f.Width * height / f.Height
	}
	if width <= 0 || height <= 0 {
		return fmt.Errorf("plot: figure size %g × %g pt is not positive", width.Points(), height.Points())
	}
	var c vg.CanvasWriterTo
	switch strings.ToLower(format) {
	case SVG:
		c = vgsvg.New(width, height)
	case PNG:
		c = vgimg.PngCanvas{Canvas: vgimg.NewWith(vgimg.UseWH(width, height), vgimg.UseDPI(DPI), vgimg.UseBackgroundColor(colorWhite))}
	default:
		return fmt.Errorf("%w: %q", ErrFormat, format)
	}
	f.Draw(draw.New(c))
	_, err := c.WriteTo(w)
	return err
}

// Save writes f to the file path in the format of its extension (.svg or
// .png), at width × height (zero: f's natural size). It writes a temporary
// file in the same folder and renames it into place, so that path holds
// either the old picture or the whole new one.
func Save(f *Figure, path string, width, height vg.Length) (err error) {
	format, err := FormatOf(path)
	if err != nil {
		return err
	}
	tmp, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".*")
	if err != nil {
		return fmt.Errorf("plot: %w", err)
	}
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(tmp.Name())
		}
	}()
	if err = Write(tmp, f, format, width, height); err != nil {
		return fmt.Errorf("plot: write %s: %w", path, err)
	}
	if err = tmp.Sync(); err != nil {
		return fmt.Errorf("plot: write %s: %w", path, err)
	}
	if err = tmp.Close(); err != nil {
		return fmt.Errorf("plot: write %s: %w", path, err)
	}
	if err = os.Chmod(tmp.Name(), 0o644); err != nil {
		return fmt.Errorf("plot: write %s: %w", path, err)
	}
	if err = os.Rename(tmp.Name(), path); err != nil {
		return fmt.Errorf("plot: write %s: %w", path, err)
	}
	return nil
}

// Encode returns f drawn in format (SVG or PNG) at its natural size.
func Encode(f *Figure, format string) ([]byte, error) {
	var buf bytes.Buffer
	if err := Write(&buf, f, format, 0, 0); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// Beside returns the path of the picture called name that goes beside the
// main picture at path: path itself when name is main, else path with
// "-name" before its extension (prep.svg, prep-deviation.svg, ...).
func Beside(path, main, name string) string {
	if name == main {
		return path
	}
	ext := filepath.Ext(path)
	return strings.TrimSuffix(path, ext) + "-" + name + ext
}

// MediaType returns the media type of format: image/svg+xml for SVG,
// image/png for PNG.
func MediaType(format string) string {
	if format == PNG {
		return "image/png"
	}
	return "image/svg+xml"
}
