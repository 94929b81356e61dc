package stage

import (
	"github.com/hashicorp/go-plugin"
)

// ProtocolVersion is the version of the stage protocol this package speaks.
// It changes only for an incompatible change of plugins/proto/stage/v1.
const ProtocolVersion = 1

// LogLevelEnv is the environment variable the host sets to the log level
// (trace, debug, info, warn, error, off) a stage should log at. Unset means
// warn.
const LogLevelEnv = "FOILWRIGHT_STAGE_LOG"

// PluginName is the name under which a stage is served and dispensed.
const PluginName = "stage"

// Handshake is the go-plugin handshake of every foilwright stage. The magic
// cookie only keeps a stage from being started by hand by mistake; it is not
// a security measure.
var Handshake = plugin.HandshakeConfig{
	ProtocolVersion:  ProtocolVersion,
	MagicCookieKey:   "FOILWRIGHT_STAGE_COOKIE",
	MagicCookieValue: "5f1c0a52e9d84b7f-foilwright-stage",
}

// PluginMap returns the plugin set of protocol version ProtocolVersion.
// impl is the stage to serve; the host passes nil.
func PluginMap(impl Stage) plugin.PluginSet {
	return plugin.PluginSet{PluginName: &Plugin{Impl: impl}}
}

// VersionedPlugins returns the plugin sets of every protocol version this
// package speaks, for ServeConfig.VersionedPlugins and
// ClientConfig.VersionedPlugins. impl is the stage to serve; the host passes
// nil.
func VersionedPlugins(impl Stage) map[int]plugin.PluginSet {
	return map[int]plugin.PluginSet{ProtocolVersion: PluginMap(impl)}
}

// WindowSize is the HTTP/2 flow-control window, in bytes, that the host
// and a stage served by package sdk each give the other for a stream and
// for the connection. It is fixed: with windows it may grow, gRPC sends a
// bandwidth-probing ping with every message received, which the other
// process wakes to answer (about one write and two reads more a call), and
// a window update after every few tens of kilobytes. It is the largest
// message a stage served by package sdk takes or sends, so a sender
// rarely waits for a window update (a larger message still flows, window
// by window).
const WindowSize = 64 << 20
