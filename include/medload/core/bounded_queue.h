// A first-in first-out hand-over between threads that holds at most a fixed number of
// items: Push waits while it is full, Pop while it is empty, and Close wakes both for
// good. It does not own what its items point to, and it does not order several
// producers' items among themselves beyond their arrival.
#pragma once

#include <condition_variable>
#include <cstddef>
#include <deque>
#include <mutex>
#include <optional>
#include <utility>

namespace medload {

template <typename T>
class BoundedQueue {
 public:
  // REQUIRES: capacity >= 1.
  explicit BoundedQueue(size_t capacity) : capacity_(capacity < 1 ? 1 : capacity) {}
  BoundedQueue(const BoundedQueue&) = delete;
  BoundedQueue& operator=(const BoundedQueue&) = delete;

  // Appends `item`, waiting while the queue holds `capacity` items. Returns false, and
  // drops the item, when the queue is closed (before or during the wait).
  bool Push(T item) {
    std::unique_lock lock(mutex_);
    has_room_.wait(lock, [&] { return closed_ || items_.size() < capacity_; });
    if (closed_) return false;
    items_.push_back(std::move(item));
    lock.unlock();
    has_item_.notify_one();
    return true;
  }

  // The oldest item, waiting while the queue is empty and open; nullopt once it is closed
  // and every item pushed before the close has been taken.
  std::optional<T> Pop() {
    std::unique_lock lock(mutex_);
    has_item_.wait(lock, [&] { return closed_ || !items_.empty(); });
    if (items_.empty()) return std::nullopt;
    T item = std::move(items_.front());
    items_.pop_front();
    lock.unlock();
    has_room_.notify_one();
    return item;
  }

  // No more pushes: waiting and later Push calls return false; Pop drains what is left.
  void Close() {
    {
      std::lock_guard lock(mutex_);
      closed_ = true;
    }
    has_room_.notify_all();
    has_item_.notify_all();
  }

 private:
  const size_t capacity_;
  std::mutex mutex_;
  std::condition_variable has_room_;
  std::condition_variable has_item_;
  std::deque<T> items_;
  bool closed_ = false;
};

}  // namespace medload
