package survey

import (
	"os"
	"sync"
)

// Temporary files being written, removed by RemoveTemps on an interrupt.
var temps struct {
	sync.Mutex
	names map[string]bool
}

// RegisterTemp records a temporary file that RemoveTemps should delete.
func RegisterTemp(name string) {
	temps.Lock()
	defer temps.Unlock()
	if temps.names == nil {
		temps.names = map[string]bool{}
	}
	temps.names[name] = true
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
	for name := range temps.names {
		os.Remove(name)
		delete(temps.names, name)
	}
}
