#include "medload/core/bounded_queue.h"

#include <doctest/doctest.h>

#include <atomic>
#include <chrono>
#include <thread>
#include <vector>

namespace medload {

TEST_SUITE("core/bounded_queue") {

TEST_CASE("Items come out in the order they were pushed") {
  BoundedQueue<int> queue(4);
  CHECK(queue.Push(3));
  CHECK(queue.Push(1));
  CHECK(queue.Push(2));
  CHECK(queue.Pop() == 3);
  CHECK(queue.Pop() == 1);
  CHECK(queue.Pop() == 2);
}

TEST_CASE("A closed queue refuses pushes and hands out what it held, then nothing") {
  BoundedQueue<int> queue(4);
  CHECK(queue.Push(7));
  queue.Close();
  CHECK_FALSE(queue.Push(8));
  CHECK(queue.Pop() == 7);
  CHECK(queue.Pop() == std::nullopt);
  CHECK(queue.Pop() == std::nullopt);
}

TEST_CASE("Push waits while the queue is full until an item is taken") {
  BoundedQueue<int> queue(2);
  CHECK(queue.Push(1));
  CHECK(queue.Push(2));
  std::atomic<bool> pushed{false};
  std::thread producer([&] {
    CHECK(queue.Push(3));
    pushed = true;
  });
  // The producer cannot finish before a Pop makes room (the sleep only gives it time to
  // reach the wait; the check does not depend on it).
  std::this_thread::sleep_for(std::chrono::milliseconds(20));
  CHECK_FALSE(pushed.load());
  CHECK(queue.Pop() == 1);
  producer.join();
  CHECK(pushed.load());
  CHECK(queue.Pop() == 2);
  CHECK(queue.Pop() == 3);
}

TEST_CASE("Closing wakes a producer waiting on a full queue, whose item is dropped") {
  BoundedQueue<int> queue(1);
  CHECK(queue.Push(1));
  std::atomic<int> result{-1};
  std::thread producer([&] { result = queue.Push(2) ? 1 : 0; });
  std::this_thread::sleep_for(std::chrono::milliseconds(20));
  queue.Close();
  producer.join();
  CHECK(result.load() == 0);
  CHECK(queue.Pop() == 1);
  CHECK(queue.Pop() == std::nullopt);
}

TEST_CASE("Closing wakes a consumer waiting on an empty queue") {
  BoundedQueue<int> queue(1);
  std::atomic<bool> got_nothing{false};
  std::thread consumer([&] { got_nothing = !queue.Pop().has_value(); });
  std::this_thread::sleep_for(std::chrono::milliseconds(20));
  queue.Close();
  consumer.join();
  CHECK(got_nothing.load());
}

TEST_CASE("One producer and one consumer through a small queue lose and reorder nothing") {
  BoundedQueue<int> queue(3);
  constexpr int kItems = 20000;
  std::atomic<int> refused{0};
  std::thread producer([&] {
    for (int i = 0; i < kItems; ++i) {
      if (!queue.Push(i)) ++refused;
    }
    queue.Close();
  });
  std::vector<int> taken;
  while (std::optional<int> item = queue.Pop()) taken.push_back(*item);
  producer.join();
  CHECK(refused.load() == 0);
  REQUIRE(taken.size() == static_cast<size_t>(kItems));
  for (int i = 0; i < kItems; ++i) {
    CAPTURE(i);
    REQUIRE(taken[static_cast<size_t>(i)] == i);
  }
}

}  // TEST_SUITE

}  // namespace medload
