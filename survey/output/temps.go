package output

import (
	"errors"
	"os"
	"sync"
)

// Temporary files being written, removed by RemoveTemps on an interrupt.
var temps struct {
	sync.Mutex
	names map[string]bool
	// closed is set by RemoveTemps: no temporary file may be made after.
	closed bool
}

// UnregisterTemp forgets a temporary file (renamed into place or removed).
func UnregisterTemp(name string) {
	temps.Lock()
	defer temps.Unlock()
	delete(temps.names, name)
}

// RemoveTemps deletes every temporary file still being written. The command
// calls it when interrupted, so that no partial output is left behind.
func RemoveTemps() {
	temps.Lock()
	defer temps.Unlock()
	temps.closed = true
	for name := range temps.names {
		os.Remove(name)
		delete(temps.names, name)
	}
}

// errInterrupted refuses a temporary file once RemoveTemps has run.
var errInterrupted = errors.New("interrupted: no more output is written")

// openTemp creates and registers a temporary file under the lock that
// RemoveTemps takes, so that no file is ever created unregistered or after
// the clean-up.
func openTemp(name string) (*os.File, error) {
	temps.Lock()
	defer temps.Unlock()
	if temps.closed {
		return nil, errInterrupted
	}
	f, err := os.OpenFile(name, os.O_RDWR|os.O_CREATE|os.O_EXCL, 0o600)
	if err != nil {
		return nil, err
	}
	if temps.names == nil {
		temps.names = map[string]bool{}
	}
	temps.names[name] = true
	return f, nil
}
