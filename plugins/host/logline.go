package host

import (
	"encoding/json"
	"sort"
	"strings"
	"time"

	"github.com/hashicorp/go-hclog"
)

// A stage logs to its stderr, one line at a time. go-plugin parses those
// lines itself, strictly: it reads "@timestamp" only with exactly six
// fraction digits, so a line with JavaScript's three (Date.toISOString) or
// none at all fell to raw debug text and a stage's warnings vanished at the
// default level. The host parses them itself instead (logLine), and gives
// go-plugin a logger that drops its copy (pluginLogger).

// pluginLogger is the logger go-plugin gets for a stage: go-plugin's own
// messages go to the embedded logger; the sub-logger it names after the
// executable for the stage's stderr lines is silent (go-plugin then skips
// parsing them), since the host logs those lines itself.
type pluginLogger struct {
	hclog.Logger
	stderrName string // the base name of the executable
}

func (l pluginLogger) Named(name string) hclog.Logger {
	if name == l.stderrName {
		return hclog.NewNullLogger()
	}
	return pluginLogger{l.Logger.Named(name), l.stderrName}
}

// lineLogger logs a stage's stderr lines on log at their levels.
type lineLogger struct {
	log     hclog.Logger
	inPanic bool // a Go crash report began: the lines after it are errors
}

// logLine logs one line of a stage's stderr:
//
//   - a JSON object with a string "@message" is logged at its "@level"
//     (trace, debug, info, warn or error; debug when missing or unknown),
//     its other keys as key-value pairs; "@timestamp", when present, is
//     an RFC 3339 time with any number of fraction digits (or none), kept
//     as the pair "timestamp" when it parses and left out otherwise;
//   - another line starting with [TRACE], [DEBUG], [INFO], [WARN] or
//     [ERROR] is logged at that level;
//   - "panic: " or "fatal error: " begin a Go crash report, logged as
//     errors to the end;
//   - anything else is logged at debug.
func (l *lineLogger) logLine(line string) {
	if strings.HasPrefix(line, "{") {
		if msg, level, args, ok := parseLogJSON(line); ok {
			switch level {
			case hclog.Trace:
				l.log.Trace(msg, args...)
			case hclog.Info:
				l.log.Info(msg, args...)
			case hclog.Warn:
				l.log.Warn(msg, args...)
			case hclog.Error:
				l.log.Error(msg, args...)
			default:
				l.log.Debug(msg, args...)
			}
			return
		}
	}
	switch {
	case strings.HasPrefix(line, "[TRACE]"):
		l.log.Trace(line)
	case strings.HasPrefix(line, "[DEBUG]"):
		l.log.Debug(line)
	case strings.HasPrefix(line, "[INFO]"):
		l.log.Info(line)
	case strings.HasPrefix(line, "[WARN]"):
		l.log.Warn(line)
	case strings.HasPrefix(line, "[ERROR]"):
		l.log.Error(line)
	case crashStart(line):
		l.inPanic = true
		l.log.Error(line)
	case l.inPanic:
		l.log.Error(line)
	default:
		l.log.Debug(line)
	}
}

// parseLogJSON reads an hclog JSON line: its message, level and the other
// keys as sorted key-value pairs.
func parseLogJSON(line string) (msg string, level hclog.Level, args []any, ok bool) {
	var m map[string]any
	if json.Unmarshal([]byte(line), &m) != nil {
		return "", 0, nil, false
	}
	msg, ok = m["@message"].(string)
	if !ok {
		return "", 0, nil, false
	}
	level = hclog.Debug
	if s, _ := m["@level"].(string); s != "" {
		if lv := hclog.LevelFromString(s); lv != hclog.NoLevel && lv != hclog.Off {
			level = lv
		}
	}
	keys := make([]string, 0, len(m))
	for k := range m {
		if k != "@message" && k != "@level" && k != "@timestamp" {
			keys = append(keys, k)
		}
	}
	sort.Strings(keys)
	for _, k := range keys {
		args = append(args, k, m[k])
	}
	if s, _ := m["@timestamp"].(string); s != "" {
		if ts, err := time.Parse(time.RFC3339Nano, s); err == nil {
			args = append(args, "timestamp", ts.Format(hclog.TimeFormat))
		}
	}
	return msg, level, args, true
}
