package server

import "sync"

// cache is a bounded map from request keys to answers, safe for concurrent use. It keeps two
// generations of at most half the capacity each: a lookup that finds a key in the older one
// moves it to the newer one, and when the newer one is full the older one is dropped. Lookups
// and stores are O(1), memory is bounded by the capacity, and keys in use survive.
type cache[V any] struct {
	mu       sync.Mutex
	half     int
	cur, old map[string]V
}

// newCache returns a cache holding at most capacity entries, or nil (no caching) when
// capacity is not positive. A nil *cache is valid and empty.
func newCache[V any](capacity int) *cache[V] {
	if capacity <= 0 {
		return nil
	}
	half := max(capacity/2, 1)
	return &cache[V]{half: half, cur: make(map[string]V, half)}
}

func (c *cache[V]) get(key string) (V, bool) {
	var zero V
	if c == nil {
		return zero, false
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	if v, ok := c.cur[key]; ok {
		return v, true
	}
	if v, ok := c.old[key]; ok {
		delete(c.old, key)
		c.putLocked(key, v)
		return v, true
	}
	return zero, false
}

func (c *cache[V]) put(key string, v V) {
	if c == nil {
		return
	}
	c.mu.Lock()
	c.putLocked(key, v)
	c.mu.Unlock()
}

func (c *cache[V]) putLocked(key string, v V) {
	if _, ok := c.cur[key]; !ok && len(c.cur) >= c.half {
		c.old, c.cur = c.cur, make(map[string]V, c.half)
	}
	c.cur[key] = v
}

// len is the number of entries held.
func (c *cache[V]) len() int {
	if c == nil {
		return 0
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	return len(c.cur) + len(c.old)
}
